/**
 * npm run backup [-- --dir DIR]
 * A consistent copy of the database (DATABASE_URL) while Rollbead runs, through SQLite's online
 * backup API; written to DIR (default BACKUP_DIR, else `backups/` beside the database) as
 * rollbead-<UTC time>.db, checked with PRAGMA integrity_check. Keeps the newest BACKUP_KEEP
 * when that is set.
 */
import { parseArgs } from 'node:util';
import { dirname, join, resolve } from 'node:path';
import { existsSync } from 'node:fs';
import Database from 'better-sqlite3';
import { databasePath } from '../src/lib/server/db';
import { backupDatabase, checkDatabaseFile, pruneBackups } from '../src/lib/server/backup';

async function main(): Promise<void> {
	const { values } = parseArgs({ options: { dir: { type: 'string' } } });
	const source = databasePath();
	if (!existsSync(source)) {
		console.error(`error: no database at ${source} (DATABASE_URL).`);
		process.exit(1);
	}
	const dir = resolve(
		values.dir ?? (process.env.BACKUP_DIR?.trim() || join(dirname(source), 'backups'))
	);
	// Its own connection: the running server's connections go on reading and writing meanwhile.
	const db = new Database(source, { fileMustExist: true });
	db.pragma('busy_timeout = 5000');
	try {
		const result = await backupDatabase(db, dir);
		const check = checkDatabaseFile(result.file);
		console.log(
			`Backed up ${source}\n  to ${result.file}\n  ${(result.bytes / 1048576).toFixed(1)} MB in ${result.tookMs} ms; ` +
				`integrity_check ok; ${check.counts.users} users, ${check.counts.audit_log} audit entries, ${check.counts.spi_boards ?? 0} SPI boards`
		);
		const keep = Number(process.env.BACKUP_KEEP);
		if (Number.isInteger(keep) && keep >= 1) {
			const removed = pruneBackups(dir, keep);
			if (removed.length)
				console.log(`  removed ${removed.length} older backup(s) (BACKUP_KEEP=${keep})`);
		}
	} finally {
		db.close();
	}
}

main().catch((err) => {
	console.error(`error: ${(err as Error).message}`);
	process.exit(1);
});
