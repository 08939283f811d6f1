import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';

const dir = mkdtempSync(join(tmpdir(), 'rollbead-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function token(args: string[], databaseUrl = join(dir, 'cli.db')) {
	const result = spawnSync('npx', ['tsx', 'scripts/token.ts', ...args], {
		env: { ...process.env, DATABASE_URL: databaseUrl },
		encoding: 'utf8',
		timeout: 25_000
	});
	return { status: result.status, stdout: result.stdout, stderr: result.stderr };
}

describe('npm run token', () => {
	it('creates a token and prints it alone on the last line', () => {
		const { status, stdout } = token(['create', '--name', 'line 1 SPI', '--role', 'quality']);
		expect(status).toBe(0);
		const lines = stdout.trim().split('\n');
		expect(lines[lines.length - 1]).toMatch(/^rb_[A-Za-z0-9_-]{43}$/);
		const list = token(['list']);
		const listed = /\tquality\tactive until (\S+)\tline 1 SPI/.exec(list.stdout);
		expect(listed, list.stdout).not.toBeNull();
		// Tokens expire after 90 days unless --days says otherwise (README, Security).
		const daysLeft = (Date.parse(listed![1]) - Date.now()) / 86_400_000;
		expect(daysLeft).toBeGreaterThan(89.9);
		expect(daysLeft).toBeLessThanOrEqual(90);
	}, 30_000);

	it.each([
		[['create', '--name', 'x', '--role', 'boss'], /--role must be one of: admin, engineer/],
		[['create', '--role', 'viewer'], /--name is required/],
		[['revoke', '--id', 'abc'], /--id must be a token id/],
		[['frobnicate'], /unknown command "frobnicate"/],
		[[], /no command given/]
	])(
		'refuses %j with a message and a non-zero exit',
		(args, message) => {
			const { status, stderr } = token(args as string[]);
			expect(status).toBe(1);
			expect(stderr).toMatch(message);
		},
		30_000
	);

	it('says clearly when the database cannot be opened', () => {
		// A regular file where the database folder should be.
		const blocker = join(dir, 'not-a-folder');
		writeFileSync(blocker, 'x');
		const { status, stderr } = token(['list'], join(blocker, 'x.db'));
		expect(status).toBe(1);
		expect(stderr).toContain(`Cannot open the database at ${join(blocker, 'x.db')}`);
	}, 30_000);
});
