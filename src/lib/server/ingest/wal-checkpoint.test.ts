import Database from 'better-sqlite3';
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { checkpointWal } from './wal-checkpoint';

const dirs: string[] = [];
afterEach(() => {
	for (const d of dirs.splice(0)) rmSync(d, { recursive: true, force: true });
});

describe('checkpointWal', () => {
	it('copies committed pages from the WAL into the database file', () => {
		const dir = mkdtempSync(join(tmpdir(), 'rollbead-ckpt-'));
		dirs.push(dir);
		const file = join(dir, 'a.db');
		const db = new Database(file);
		db.pragma('journal_mode = WAL');
		db.pragma('wal_autocheckpoint = 0');
		db.exec('create table t (x blob)');
		const insert = db.prepare('insert into t values (zeroblob(4096))');
		for (let i = 0; i < 200; i++) insert.run();
		const before = statSync(file).size;
		expect(checkpointWal(Database, file)).toBeNull();
		expect(statSync(file).size).toBeGreaterThan(before + 200 * 4096 - 1);
		db.close();
	});

	it('never creates a database that is gone; it answers with the reason', () => {
		const dir = mkdtempSync(join(tmpdir(), 'rollbead-ckpt-'));
		dirs.push(dir);
		expect(checkpointWal(Database, join(dir, 'moved.db'))).toMatch(
			/unable to open|does not exist/i
		);
	});

	it('uses nothing but its arguments, so its source runs as the thread code', () => {
		const run = new Function(
			'Sqlite',
			'file',
			`return (${checkpointWal.toString()})(Sqlite, file);`
		);
		const dir = mkdtempSync(join(tmpdir(), 'rollbead-ckpt-'));
		dirs.push(dir);
		expect(run(Database, join(dir, 'moved.db'))).toMatch(/unable to open|does not exist/i);
	});
});
