// Playwright configuration for the hand-run map timing (scripts/bench-stencil-map.pw.ts): the same
// app, build and throw-away database as the e2e suite, only a different test file.
//   flock /tmp/rollbead-e2e.lock npx playwright test -c scripts/bench-stencil-map.config.ts
import { fileURLToPath } from 'node:url';
import base from '../playwright.config';

// Paths in a Playwright config resolve against the config's folder; the app lives one up.
const root = fileURLToPath(new URL('..', import.meta.url));

export default {
	...base,
	testDir: '.',
	testMatch: 'bench-stencil-map.pw.ts',
	timeout: 600_000,
	reporter: [['list']],
	outputDir: `${root}/.test-results/bench-artifacts`,
	projects: [{ name: 'desktop', use: { viewport: { width: 1280, height: 800 } } }],
	webServer: { ...base.webServer, cwd: root }
};
