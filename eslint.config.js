// ESLint: the recommended JavaScript, TypeScript and Svelte rules, checked in CI (`npm run lint`).
import js from '@eslint/js';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

export default ts.config(
	js.configs.recommended,
	...ts.configs.recommended,
	...svelte.configs.recommended,
	{
		languageOptions: { globals: { ...globals.browser, ...globals.node } }
	},
	{
		files: ['**/*.svelte', '**/*.svelte.ts', '**/*.svelte.js'],
		languageOptions: {
			parserOptions: {
				projectService: true,
				extraFileExtensions: ['.svelte'],
				parser: ts.parser,
				svelteConfig
			}
		}
	},
	{
		rules: {
			// The parsers look for control characters on purpose (binary files, invisible cells).
			'no-control-regex': 'off',
			// Maps, Dates and URLSearchParams built inside functions are scratch values, not state;
			// the rule cannot tell them from reactive fields, and the pages keep state in runes.
			'svelte/prefer-svelte-reactivity': 'off',
			// Rollbead is served at the root (no kit.paths.base), so links need no resolve().
			'svelte/no-navigation-without-resolve': 'off',
			// Unused names prefixed with _ are deliberate (callbacks with a fixed signature).
			'@typescript-eslint/no-unused-vars': [
				'error',
				{ argsIgnorePattern: '^_', varsIgnorePattern: '^_', caughtErrors: 'none' }
			]
		}
	},
	{
		ignores: [
			'build/',
			'.svelte-kit/',
			'node_modules/',
			'.e2e/',
			'.test-results/',
			'data/',
			'drizzle/'
		]
	}
);
