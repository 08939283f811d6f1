import { expect, test } from '@playwright/test';
import { spawn } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { SERVER_ENTRY } from '../../scripts/lib/own-server';

// Runs the same build the other specs use (the web server built it before any spec started).
test('a server with a database that cannot be opened exits 1 with a clear message', async () => {
	const dir = mkdtempSync(join(tmpdir(), 'rollbead-start-'));
	const blocker = join(dir, 'not-a-folder');
	writeFileSync(blocker, 'x');
	const child = spawn(process.execPath, [SERVER_ENTRY], {
		env: { ...process.env, PORT: '0', DATABASE_URL: join(blocker, 'rollbead.db') },
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let stderr = '';
	child.stderr.on('data', (chunk) => (stderr += chunk));
	const code = await new Promise<number | null>((resolve) => {
		const timer = setTimeout(() => child.kill('SIGKILL'), 30_000);
		child.on('exit', (exitCode) => {
			clearTimeout(timer);
			resolve(exitCode);
		});
	});
	rmSync(dir, { recursive: true, force: true });
	expect(code).toBe(1);
	expect(stderr).toContain(`Cannot open the database at ${join(blocker, 'rollbead.db')}`);
	expect(stderr).not.toMatch(/^\s+at /m);
});
