// `npm test`: unit tests (vitest), then end-to-end tests (Playwright against Debian's Chromium),
// then one closing line "N passed, N failed" over both.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, rmSync } from 'node:fs';

const chromium = process.env.CHROMIUM_PATH ?? '/usr/bin/chromium';
if (!existsSync(chromium)) {
	console.error(
		`Chromium is missing at ${chromium}; the end-to-end tests need it.\n` +
			'Install it with:  sudo apt-get update && sudo apt-get install -y chromium\n' +
			'(or set CHROMIUM_PATH to another Chromium binary).'
	);
	process.exit(1);
}

rmSync('.test-results', { recursive: true, force: true });
mkdirSync('.test-results', { recursive: true });

function run(command, args) {
	const result = spawnSync(command, args, { stdio: 'inherit', env: process.env });
	return result.status ?? 1;
}

// Static checks first (a few minutes in all): formatting, lint, types and the import rules. Each
// counts as one check in the closing line.
const STATIC_CHECKS = [
	['formatting (prettier --check)', 'npx', ['prettier', '--check', '--log-level', 'warn', '.']],
	['lint (eslint)', 'npx', ['eslint', '.']],
	['types (svelte-check)', 'npm', ['run', '--silent', 'check', '--', '--threshold', 'error']],
	[
		'import rules (dependency-cruiser)',
		'npx',
		['depcruise', 'src', '--config', '.dependency-cruiser.cjs', '--output-type', 'err']
	]
];
const staticFailures = [];
for (const [name, command, args] of STATIC_CHECKS) {
	console.log(`\n— ${name}`);
	if (run(command, args) !== 0) staticFailures.push(name);
}
if (staticFailures.length) console.error(`Static checks failed: ${staticFailures.join(', ')}`);

const unitStatus = run('npx', [
	'vitest',
	'run',
	'--reporter=default',
	'--reporter=json',
	'--outputFile.json=.test-results/unit.json'
]);
const e2eStatus = run('npx', ['playwright', 'test']);

function readJson(path) {
	try {
		return JSON.parse(readFileSync(path, 'utf8'));
	} catch {
		return null;
	}
}

const unit = readJson('.test-results/unit.json');
const e2e = readJson('.test-results/e2e.json');
const staticPassed = STATIC_CHECKS.length - staticFailures.length;
const passed = staticPassed + (unit?.numPassedTests ?? 0) + (e2e?.stats?.expected ?? 0);
const failed =
	staticFailures.length +
	(unit?.numFailedTests ?? 0) +
	(e2e?.stats?.unexpected ?? 0) +
	(e2e?.stats?.flaky ?? 0);
const skipped = (unit?.numPendingTests ?? 0) + (e2e?.stats?.skipped ?? 0);
const missing = [!unit && 'unit', !e2e && 'e2e'].filter(Boolean);
if (missing.length) console.error(`No results from the ${missing.join(' and ')} run(s).`);

console.log(`\n${passed} passed, ${failed} failed, ${skipped} skipped`);
process.exit(
	staticFailures.length || unitStatus !== 0 || e2eStatus !== 0 || missing.length || failed ? 1 : 0
);
