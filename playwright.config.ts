import { defineConfig, devices } from '@playwright/test';
import { freePort } from './scripts/lib/own-server';

// A free port, chosen once by the runner and inherited by its workers through the env.
process.env.E2E_PORT ??= String(await freePort());
const port = Number(process.env.E2E_PORT);
const baseURL = `http://localhost:${port}`;
export const E2E_DATABASE = '.e2e/rollbead.db';

export default defineConfig({
	testDir: 'tests/e2e',
	testMatch: '**/*.e2e.ts',
	workers: 1,
	retries: 0,
	timeout: 60_000,
	expect: { timeout: 10_000 },
	reporter: [['list'], ['json', { outputFile: '.test-results/e2e.json' }]],
	outputDir: '.test-results/e2e-artifacts',
	use: {
		baseURL,
		browserName: 'chromium',
		trace: 'retain-on-failure',
		launchOptions: {
			executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
			args: [
				'--headless',
				'--no-sandbox',
				'--disable-gpu',
				'--disable-quic',
				'--no-first-run',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync'
			]
		}
	},
	projects: [
		{
			name: 'desktop',
			use: { viewport: { width: 1280, height: 800 } },
			testIgnore: '**/*.tablet.e2e.ts'
		},
		{
			name: 'tablet',
			use: { ...devices['Galaxy Tab S4'], browserName: 'chromium' },
			testMatch: '**/*.tablet.e2e.ts'
		}
	],
	webServer: {
		// A throw-away database on every run; the real app, built and started as `npm start` does.
		command: 'rm -rf .e2e && node scripts/ensure-build.js && node server.js',
		url: `${baseURL}/api/health`,
		timeout: 300_000,
		reuseExistingServer: false,
		stdout: 'pipe',
		env: {
			PORT: String(port),
			HOST: '127.0.0.1',
			ORIGIN: baseURL,
			DATABASE_URL: E2E_DATABASE,
			SPI_WATCH_DIR: '.e2e/spi-inbox',
			ROLLBEAD_DEMO: '1'
		}
	}
});
