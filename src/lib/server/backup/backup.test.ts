import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { existsSync, mkdirSync, readdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { openDatabase, type Db } from '../db';
import { openTestDatabase } from '../testing';
import { ingestSpiFile, recoverInterruptedImports } from '../ingest';
import {
	backupDatabase,
	backupScheduleFrom,
	checkDatabaseFile,
	listBackups,
	pruneBackups,
	restoreDatabase,
	RestoreRefusedError,
	startBackupSchedule
} from './backup';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';

/** An SPI export: `boards` boards of `padsPerBoard` pads each (invented serials). */
function spiFile(prefix: string, boards: number, padsPerBoard: number): Uint8Array {
	const lines = [HEADER];
	for (let b = 0; b < boards; b++) {
		const at = new Date(Date.UTC(2026, 2, 2, 8, 0, b)).toISOString();
		for (let p = 0; p < padsPerBoard; p++) {
			lines.push(
				`${prefix}-${b},${at},L1,PB-100,0,U${p % 40},${p},${95 + (p % 10)},100,120,0,0,pass`
			);
		}
	}
	return new TextEncoder().encode(lines.join('\n') + '\n');
}

/** The file as an upload arrives: 16 KiB pieces, each in a later turn of the event loop. */
async function* chunks(bytes: Uint8Array): AsyncGenerator<Uint8Array> {
	for (let i = 0; i < bytes.length; i += 16 * 1024) {
		await new Promise((r) => setImmediate(r));
		yield bytes.subarray(i, i + 16 * 1024);
	}
}

/** What a reader sees: finished imports, their boards and the pad rows reached through them. */
function visible(db: Database.Database) {
	const n = (sql: string) => db.prepare(sql).pluck().get() as number;
	return {
		imports: n(`select count(*) from spi_imports where status = 'imported'`),
		boards: n(
			`select count(*) from spi_boards b join spi_imports i on i.id = b.import_id where i.status = 'imported'`
		),
		pads: n(
			`select count(*) from spi_pad_measurements m join spi_boards b on b.id = m.board_id
			 join spi_imports i on i.id = b.import_id where i.status = 'imported'`
		),
		users: n('select count(*) from users')
	};
}

let t: ReturnType<typeof openTestDatabase>;
beforeEach(() => (t = openTestDatabase()));
afterEach(() => t.close());

describe('backups', { timeout: 120_000 }, () => {
	it('takes a consistent copy while an import runs; the checked restore matches and passes integrity_check', async () => {
		const db = t.db;
		const first = await ingestSpiFile(db, {
			source: 'api',
			fileName: 'a.csv',
			body: chunks(spiFile('BK-A', 20, 50)),
			createdBy: 'user:1'
		});
		expect(first.status).toBe('imported');
		const before = visible(db.$client);

		// A larger import, and a backup started while it runs.
		const importing = ingestSpiFile(db, {
			source: 'api',
			fileName: 'b.csv',
			body: chunks(spiFile('BK-B', 400, 100)),
			createdBy: 'user:1'
		});
		let importFinished = false;
		void importing.then(() => (importFinished = true));
		await new Promise((r) => setTimeout(r, 20));
		const backupDir = join(t.dir, 'backups');
		const backingUp = backupDatabase(db.$client, backupDir);
		// The backup starts while the import is still writing its chunks.
		expect(importFinished).toBe(false);
		const backup = await backingUp;
		expect((await importing).status).toBe('imported');
		const after = visible(db.$client);
		expect(after.boards).toBe(before.boards + 400);

		const check = checkDatabaseFile(backup.file);
		expect(check).toMatchObject({ ok: true, problems: [] });
		expect(readdirSync(backupDir)).toEqual([backup.file.split('/').pop()]);

		// Restore over a copy of the live database, as `npm run restore` does.
		const target = join(t.dir, 'restored', 'rollbead.db');
		mkdirSync(join(t.dir, 'restored'));
		await db.$client.backup(target);
		const restored = await restoreDatabase(backup.file, target);
		expect(restored.previousKeptAs && existsSync(restored.previousKeptAs)).toBe(true);
		expect(restored.check.ok).toBe(true);

		const reopened: Db = openDatabase(target);
		try {
			await recoverInterruptedImports(reopened);
			const integrity = reopened.$client.pragma('integrity_check', { simple: true });
			expect(integrity).toBe('ok');
			const seen = visible(reopened.$client);
			// One moment of the database: before the second import or after it, never part of it.
			expect([before, after]).toContainEqual(seen);
			const orphans = reopened.$client
				.prepare(
					`select count(*) from spi_pad_measurements m left join spi_boards b on b.id = m.board_id where b.id is null`
				)
				.pluck()
				.get();
			expect(orphans).toBe(0);
		} finally {
			reopened.$client.close();
		}
	});

	it('refuses to restore a damaged file or one that is not a Rollbead database, changing nothing', async () => {
		const target = join(t.dir, 'live.db');
		await t.db.$client.backup(target);
		const sizeBefore = checkDatabaseFile(target).counts.users;

		const notSqlite = join(t.dir, 'notes.db');
		writeFileSync(notSqlite, 'this is not a database\n'.repeat(200));
		await expect(restoreDatabase(notSqlite, target)).rejects.toThrow(RestoreRefusedError);

		const otherApp = join(t.dir, 'other.db');
		const other = new Database(otherApp);
		other.exec(
			'create table notes (id integer primary key, body text); insert into notes (body) values (1)'
		);
		other.close();
		await expect(restoreDatabase(otherApp, target)).rejects.toThrow(/not a Rollbead database/);

		// A page of the copy overwritten: integrity_check fails and the restore is refused.
		const damaged = join(t.dir, 'damaged.db');
		await t.db.$client.backup(damaged);
		const bytes = Buffer.from(await import('node:fs').then((fs) => fs.readFileSync(damaged)));
		bytes.fill(0x5a, 4096 * 2, 4096 * 3);
		writeFileSync(damaged, bytes);
		const check = checkDatabaseFile(damaged);
		expect(check.ok).toBe(false);
		await expect(restoreDatabase(damaged, target)).rejects.toThrow(RestoreRefusedError);

		expect(checkDatabaseFile(target)).toMatchObject({ ok: true });
		expect(checkDatabaseFile(target).counts.users).toBe(sizeBefore);
		expect(readdirSync(t.dir).filter((n) => n.includes('before-restore'))).toEqual([]);
	});

	it('keeps the newest BACKUP_KEEP backups and reads the schedule strictly', async () => {
		const dir = join(t.dir, 'kept');
		for (let day = 1; day <= 5; day++)
			await backupDatabase(t.db.$client, dir, new Date(Date.UTC(2026, 0, day)));
		expect(pruneBackups(dir, 3)).toHaveLength(2);
		expect(listBackups(dir).map((b) => b.name)).toEqual([
			'rollbead-20260105T000000000Z.db',
			'rollbead-20260104T000000000Z.db',
			'rollbead-20260103T000000000Z.db'
		]);

		expect(backupScheduleFrom({}, '/srv/rollbead/data/rollbead.db')).toBeNull();
		expect(backupScheduleFrom({ BACKUP_EVERY: '6h' }, '/srv/rollbead/data/rollbead.db')).toEqual({
			dir: '/srv/rollbead/data/backups',
			everyMs: 6 * 3_600_000,
			keep: 14
		});
		expect(
			backupScheduleFrom(
				{ BACKUP_EVERY: '1d', BACKUP_KEEP: '30', BACKUP_DIR: '/mnt/nas/rb' },
				'x.db'
			)
		).toEqual({
			dir: '/mnt/nas/rb',
			everyMs: 86_400_000,
			keep: 30
		});
		expect(() => backupScheduleFrom({ BACKUP_EVERY: 'daily' }, 'x.db')).toThrow(/30m, 6h or 1d/);
		expect(() => backupScheduleFrom({ BACKUP_EVERY: '1m' }, 'x.db')).toThrow(/at least 5m/);
		expect(() => backupScheduleFrom({ BACKUP_EVERY: '1h', BACKUP_KEEP: '0' }, 'x.db')).toThrow(
			/BACKUP_KEEP/
		);
	});

	it('the schedule backs up on its interval and keeps the newest BACKUP_KEEP', async () => {
		const dir = join(t.dir, 'scheduled');
		const logged: string[] = [];
		const stop = startBackupSchedule(t.db.$client, { dir, everyMs: 40, keep: 2 }, (m) =>
			logged.push(m)
		);
		for (let waited = 0; logged.length < 4 && waited < 10_000; waited += 20) {
			await new Promise((r) => setTimeout(r, 20));
		}
		stop();
		expect(logged.length).toBeGreaterThanOrEqual(4);
		expect(logged.slice(-1)[0]).toMatch(/removed 1 older/);
		const kept = listBackups(dir);
		expect(kept).toHaveLength(2);
		for (const backup of kept) expect(checkDatabaseFile(backup.file).ok).toBe(true);
	});
});
