/**
 * Backups of the SQLite database while Rollbead runs, and checked restores.
 *
 * A backup goes through SQLite's online backup API (better-sqlite3's `backup()`): it copies pages
 * while other connections keep reading and writing, and restarts when a write lands on a copied
 * page, so the copy is one consistent moment of the database — never half an import. It is
 * written under a temporary name, checked (PRAGMA integrity_check) and then renamed, so a file
 * named `rollbead-*.db` in the backup folder is always whole.
 *
 * Only this module and scripts/backup.ts, scripts/restore.ts use it; no HTTP route does.
 */
import Database from 'better-sqlite3';
import {
	copyFileSync,
	existsSync,
	mkdirSync,
	readdirSync,
	renameSync,
	rmSync,
	statSync
} from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';

const BACKUP_NAME = /^rollbead-(\d{8}T\d{6}(?:\d{3})?Z)\.db$/;

/** Tables every Rollbead database has; a file without them is not a Rollbead database. */
const REQUIRED_TABLES = ['__drizzle_migrations', 'users', 'audit_log', 'api_tokens', 'settings'];

export type BackupResult = { file: string; bytes: number; tookMs: number };

function stamp(now: Date): string {
	return now.toISOString().replace(/[-:]/g, '').replace('.', '');
}

/**
 * Copy the database `source` (an open better-sqlite3 connection, e.g. the server's) into `dir`
 * as `rollbead-<UTC time>.db`. Resolves when the copy is whole and checked.
 */
export async function backupDatabase(
	source: Database.Database,
	dir: string,
	now = new Date()
): Promise<BackupResult> {
	const started = Date.now();
	mkdirSync(dir, { recursive: true });
	const file = resolve(dir, `rollbead-${stamp(now)}.db`);
	const partial = `${file}.partial`;
	rmSync(partial, { force: true });
	try {
		// A few hundred pages a step, then yield: the server keeps answering during a long copy.
		await source.backup(partial, { progress: () => 256 });
		// One self-contained file (no -wal beside it), so copying it off-site copies all of it.
		const copy = new Database(partial);
		try {
			copy.pragma('journal_mode = DELETE');
		} finally {
			copy.close();
		}
		const check = checkDatabaseFile(partial);
		if (!check.ok) throw new Error(`The copy failed its check: ${check.problems.join('; ')}`);
		renameSync(partial, file);
	} catch (err) {
		rmSync(partial, { force: true });
		throw err;
	}
	return { file, bytes: statSync(file).size, tookMs: Date.now() - started };
}

export type FileCheck = {
	ok: boolean;
	problems: string[];
	/** Row counts of the main tables (only when the file opened). */
	counts: Record<string, number>;
	migrations: number;
};

/** Integrity and identity of a database file, opened read-only (nothing is changed). */
export function checkDatabaseFile(file: string): FileCheck {
	const problems: string[] = [];
	const counts: Record<string, number> = {};
	let migrations = 0;
	if (!existsSync(file))
		return { ok: false, problems: [`${file} does not exist.`], counts, migrations };
	let db: Database.Database | undefined;
	try {
		db = new Database(file, { readonly: true, fileMustExist: true });
		const integrity = db.pragma('integrity_check') as { integrity_check: string }[];
		const messages = integrity.map((r) => r.integrity_check);
		if (messages.length !== 1 || messages[0] !== 'ok') {
			problems.push(`integrity_check: ${messages.slice(0, 5).join('; ')}`);
		}
		const tables = new Set(
			(
				db.prepare(`select name from sqlite_master where type = 'table'`).all() as {
					name: string;
				}[]
			).map((r) => r.name)
		);
		const missing = REQUIRED_TABLES.filter((t) => !tables.has(t));
		if (missing.length) problems.push(`not a Rollbead database (no table ${missing.join(', ')})`);
		else {
			migrations = db.prepare('select count(*) from __drizzle_migrations').pluck().get() as number;
			for (const table of COUNTED_TABLES) {
				if (tables.has(table))
					counts[table] = db.prepare(`select count(*) from "${table}"`).pluck().get() as number;
			}
		}
	} catch (err) {
		problems.push(`cannot be read as SQLite: ${(err as Error).message}`);
	} finally {
		db?.close();
	}
	return { ok: problems.length === 0, problems, counts, migrations };
}

/** Tables whose row counts a check reports (and the tests compare). */
export const COUNTED_TABLES = [
	'users',
	'audit_log',
	'stencils',
	'apertures',
	'print_runs',
	'paste_lots',
	'paste_events',
	'spc_characteristics',
	'spi_imports',
	'spi_boards',
	'spi_pads',
	'spi_pad_measurements'
];

export type RestoreResult = { restored: string; previousKeptAs: string | null; check: FileCheck };

/**
 * Replace the database at `target` with the backup `file`, only after the backup passes its
 * check. The current database (with its -wal) is first copied beside it as
 * `<name>.before-restore-<time>.db`, so a restore can be undone. Run it while Rollbead is stopped.
 */
export async function restoreDatabase(
	file: string,
	target: string,
	now = new Date()
): Promise<RestoreResult> {
	const check = checkDatabaseFile(file);
	if (!check.ok) {
		throw new RestoreRefusedError(`${file} was not restored: ${check.problems.join('; ')}`);
	}
	const targetPath = resolve(target);
	if (resolve(file) === targetPath)
		throw new RestoreRefusedError('The backup is the database itself.');
	mkdirSync(dirname(targetPath), { recursive: true });
	let previousKeptAs: string | null = null;
	if (existsSync(targetPath)) {
		previousKeptAs = join(
			dirname(targetPath),
			`${basename(targetPath, '.db')}.before-restore-${stamp(now)}.db`
		);
		// Through the backup API too: it includes whatever is still in the -wal file.
		const current = new Database(targetPath, { fileMustExist: true });
		try {
			await current.backup(previousKeptAs);
		} finally {
			current.close();
		}
	}
	const staged = `${targetPath}.restoring`;
	copyFileSync(file, staged);
	for (const suffix of ['-wal', '-shm']) rmSync(targetPath + suffix, { force: true });
	renameSync(staged, targetPath);
	return { restored: targetPath, previousKeptAs, check: checkDatabaseFile(targetPath) };
}

export class RestoreRefusedError extends Error {}

/** Backups in `dir`, newest first. */
export function listBackups(dir: string): { file: string; name: string }[] {
	if (!existsSync(dir)) return [];
	return readdirSync(dir)
		.filter((name) => BACKUP_NAME.test(name))
		.sort()
		.reverse()
		.map((name) => ({ name, file: join(dir, name) }));
}

/** Keep the newest `keep` backups in `dir`; returns the names removed. */
export function pruneBackups(dir: string, keep: number): string[] {
	const removed: string[] = [];
	for (const old of listBackups(dir).slice(Math.max(1, keep))) {
		rmSync(old.file, { force: true });
		removed.push(old.name);
	}
	return removed;
}

export type BackupSchedule = { dir: string; everyMs: number; keep: number };

/**
 * BACKUP_EVERY (e.g. `30m`, `6h`, `1d`; unset = no scheduled backups), BACKUP_DIR (default
 * `backups` beside the database), BACKUP_KEEP (default 14). A malformed value is an error, not a
 * silent default: the operator asked for backups and must get them.
 */
export function backupScheduleFrom(
	env: NodeJS.ProcessEnv,
	databaseFile: string
): BackupSchedule | null {
	const every = env.BACKUP_EVERY?.trim();
	if (!every) return null;
	const match = /^(\d{1,5})\s*(m|h|d)$/i.exec(every);
	if (!match) throw new Error(`BACKUP_EVERY must look like 30m, 6h or 1d (got "${every}").`);
	const everyMs =
		Number(match[1]) *
		{ m: 60_000, h: 3_600_000, d: 86_400_000 }[match[2].toLowerCase() as 'm' | 'h' | 'd'];
	if (everyMs < 5 * 60_000) throw new Error(`BACKUP_EVERY must be at least 5m (got "${every}").`);
	const keepText = env.BACKUP_KEEP?.trim() || '14';
	if (!/^\d{1,4}$/.test(keepText) || Number(keepText) < 1) {
		throw new Error(`BACKUP_KEEP must be a whole number of at least 1 (got "${keepText}").`);
	}
	const dir = resolve(env.BACKUP_DIR?.trim() || join(dirname(resolve(databaseFile)), 'backups'));
	return { dir, everyMs, keep: Number(keepText) };
}

/** Back up every `everyMs` and keep the newest `keep`; returns a stop function. */
export function startBackupSchedule(
	source: Database.Database,
	schedule: BackupSchedule,
	log: (message: string) => void = console.log
): () => void {
	let running = false;
	const run = async () => {
		if (running) return;
		running = true;
		try {
			const result = await backupDatabase(source, schedule.dir);
			const removed = pruneBackups(schedule.dir, schedule.keep);
			log(
				`[rollbead] backup ${result.file} (${(result.bytes / 1048576).toFixed(1)} MB, ${result.tookMs} ms)` +
					(removed.length ? `; removed ${removed.length} older` : '')
			);
		} catch (err) {
			console.error('[rollbead] scheduled backup failed', err);
		} finally {
			running = false;
		}
	};
	const timer = setInterval(() => void run(), schedule.everyMs);
	timer.unref();
	return () => clearInterval(timer);
}
