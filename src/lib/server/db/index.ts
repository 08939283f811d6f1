import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import * as schema from './schema';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

/** Where the database lives: `DATABASE_URL` (a file path, optionally `file:`-prefixed). */
export function databasePath(): string {
	const url = process.env.DATABASE_URL?.trim() || 'data/rollbead.db';
	return resolve(url.replace(/^file:/, ''));
}

/** Migrations ship beside the build in `drizzle/`; the working directory is the app root. */
function migrationsFolder(): string {
	return resolve(process.env.ROLLBEAD_MIGRATIONS_DIR ?? 'drizzle');
}

export class DatabaseOpenError extends Error {}

/** How long a statement waits for another connection's write lock before SQLITE_BUSY (→ 503). */
export const BUSY_TIMEOUT_MS = 750;

/** Whether an error is SQLite's "database is locked/busy" (answered 503 + Retry-After). */
export function isDatabaseBusy(err: unknown): boolean {
	// Drizzle may wrap the driver's error in `cause`, Auth.js in `cause.err`: look through both.
	for (let e = err, depth = 0; e && typeof e === 'object' && depth < 6; depth++) {
		const { code, cause, err: inner } = e as { code?: unknown; cause?: unknown; err?: unknown };
		if (typeof code === 'string' && (code === 'SQLITE_BUSY' || code.startsWith('SQLITE_BUSY_')))
			return true;
		e = cause ?? inner;
	}
	return false;
}

/**
 * Open a SQLite database with Rollbead's pragmas and apply pending migrations.
 * WAL lets readers (charts) run while an import writes; the busy timeout makes a second writer
 * wait briefly instead of failing at once.
 * @throws DatabaseOpenError with the path and the reason when the file cannot be opened.
 */
export function openDatabase(file: string = databasePath()): Db {
	let sqlite: Database.Database;
	try {
		if (file !== ':memory:') mkdirSync(dirname(file), { recursive: true });
		sqlite = new Database(file);
		sqlite.pragma('journal_mode = WAL');
		sqlite.pragma('foreign_keys = ON');
		// Short: the wait blocks the event loop. Within the process no transaction outlives one
		// turn of it (SPI imports commit in chunks), so only another process can make a writer wait.
		sqlite.pragma(`busy_timeout = ${BUSY_TIMEOUT_MS}`);
		sqlite.pragma('synchronous = NORMAL');
	} catch (cause) {
		throw new DatabaseOpenError(
			`Cannot open the database at ${file}: ${(cause as Error).message}. ` +
				'Check DATABASE_URL, the folder permissions and free disk space.',
			{ cause }
		);
	}
	const db = drizzle(sqlite, { schema }) as Db;
	migrate(db, { migrationsFolder: migrationsFolder() });
	return db;
}

let current: Db | undefined;

/** The process-wide database, opened on first use (so `vite build` never touches it). */
export function getDb(): Db {
	current ??= openDatabase();
	return current;
}

/** Close the database (tests and shutdown). */
export function closeDb(): void {
	current?.$client.close();
	current = undefined;
}

/** Use a given database as the process-wide one (tests). */
export function setDb(db: Db): void {
	current = db;
}

export { schema };
