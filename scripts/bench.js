// `npm run bench`: every benchmark in turn. Each prints its own figures; none asserts a target.
import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

const benches = [
	['stencil check', 'scripts/bench-stencil.ts'],
	['SPI parse + validate', 'src/lib/ingest/parse-bench.ts'],
	['SPI ingest end to end', 'scripts/bench-ingest.ts'],
	['SPC chart API and rules', 'scripts/bench-spc.ts'],
	['analysis: TE scan and board trace', 'scripts/bench-analysis.ts']
];

let failed = 0;
for (const [title, file] of benches) {
	if (!existsSync(file)) continue;
	console.log(`\n== ${title} (${file}) ==`);
	const result = spawnSync('node', ['--expose-gc', '--import', 'tsx', file], { stdio: 'inherit' });
	if (result.status !== 0) failed++;
}
process.exit(failed ? 1 : 0);
