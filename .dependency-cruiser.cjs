/**
 * Import rules checked in CI (`npm run check:deps`). Kept to what the architecture promises:
 * no import cycles, and pure domain folders free of the server, the framework and the database.
 */
const PURE = '^src/lib/(spc|stencil|ingest|printlog|analysis|floor|cfx|units|format|json|csv|spi)/';

module.exports = {
	forbidden: [
		{
			name: 'no-circular',
			severity: 'error',
			comment: 'Modules that import each other cannot be understood or tested one at a time.',
			from: { path: '^src/' },
			to: { circular: true }
		},
		{
			name: 'pure-domain-stays-pure',
			severity: 'error',
			comment:
				'Domain computation is framework-free: no server code, SvelteKit, Svelte or Drizzle imports.',
			from: { path: PURE, pathNot: '\\.test\\.ts$' },
			to: {
				path: [
					'^src/lib/server/',
					'^node_modules/(@sveltejs|svelte|drizzle-orm|better-sqlite3)/',
					'^\\$app',
					'^\\$env'
				]
			}
		},
		{
			name: 'spc-analysis-owns-its-request',
			severity: 'error',
			comment:
				'The pure SPC analysis holds its own request shape; form and API schemas build on it, never the reverse.',
			from: { path: '^src/lib/spc/' },
			to: { path: '^src/lib/schemas/' }
		}
	],
	options: {
		doNotFollow: { path: 'node_modules' },
		tsPreCompilationDeps: true,
		tsConfig: { fileName: 'tsconfig.json' },
		enhancedResolveOptions: {
			exportsFields: ['exports'],
			conditionNames: ['import', 'require', 'node', 'default', 'types']
		},
		exclude: { path: ['\\.svelte-kit', 'node_modules'] }
	}
};
