import { test } from '@playwright/test';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { startServer, type OwnServer } from '../../scripts/lib/own-server';

/**
 * Servers of a spec's own (scripts/lib/own-server.ts) and a temp folder per test for their
 * databases and files: after each test its servers are stopped and the folder is removed.
 * Call once at the top of a spec file. Not a spec itself.
 */
export function ownServersPerTest(folderPrefix: string) {
	let dir = '';
	const started: OwnServer[] = [];
	test.afterEach(async () => {
		for (const server of started.splice(0)) await server.stop();
		if (dir) rmSync(dir, { recursive: true, force: true });
		dir = '';
	});
	return {
		/** This test's temp folder, made on first use. */
		folder: (): string => (dir ||= mkdtempSync(join(tmpdir(), folderPrefix))),
		/** `startServer`; stopped after the test (at once if the test already killed it). */
		async start(options: Parameters<typeof startServer>[0]): Promise<OwnServer> {
			const server = await startServer(options);
			started.push(server);
			return server;
		}
	};
}
