/**
 * The ingest's own database connection and its short write transactions: no transaction stays
 * open across an await, so other connections of this process never find the database locked.
 */
import Database from 'better-sqlite3';
import type { Db } from '../db';
import { checkpointInBackground } from './wal-checkpoint';

/** How long a chunk waits, in all, for a write lock another process holds before giving up. */
const WRITE_LOCK_WAIT_MS = 30_000;

/**
 * Why a second connection: its pragmas suit bulk appends, and its statements stay apart from the
 * request path's. A short busy timeout: within this process no transaction outlives one turn of
 * the event loop, so only another process can hold the lock, and `beginWrite` waits for that
 * without blocking the event loop.
 */
export function openIngestConnection(db: Db): { conn: Database.Database; own: boolean } {
	const file = db.$client.name;
	if (file === ':memory:' || db.$client.memory) return { conn: db.$client, own: false };
	const conn = new Database(file);
	conn.pragma('busy_timeout = 100');
	conn.pragma('synchronous = NORMAL');
	conn.pragma('foreign_keys = ON');
	// Pad rows are appended in key order, so only the b-tree's right edge is hot: a small cache does.
	conn.pragma('cache_size = -8192');
	conn.pragma('temp_store = MEMORY');
	// Checkpointed after the answer (checkpointAndClose), not inside a commit.
	conn.pragma('wal_autocheckpoint = 0');
	return { conn, own: true };
}

function isBusy(err: unknown): boolean {
	const code = (err as { code?: string }).code ?? '';
	return code === 'SQLITE_BUSY' || code.startsWith('SQLITE_BUSY_') || code === 'SQLITE_LOCKED';
}

/**
 * Open a write transaction. Another process holding the lock is waited for in short steps that
 * give the event loop back, up to `WRITE_LOCK_WAIT_MS`.
 */
export async function beginWrite(conn: Database.Database): Promise<void> {
	const started = Date.now();
	for (;;) {
		try {
			conn.exec('BEGIN IMMEDIATE');
			return;
		} catch (err) {
			if (!isBusy(err) || Date.now() - started > WRITE_LOCK_WAIT_MS) throw err;
		}
		await new Promise((r) => setTimeout(r, 25));
	}
}

/** Run `work` in one write transaction (opened when none is, committed at once). */
export async function inWriteTransaction<T>(conn: Database.Database, work: () => T): Promise<T> {
	await beginWrite(conn);
	try {
		const out = work();
		conn.exec('COMMIT');
		return out;
	} catch (err) {
		if (conn.inTransaction) conn.exec('ROLLBACK');
		throw err;
	}
}

/**
 * Close the ingest connection after the answer went out, then copy the import's pages from the
 * WAL into the database file off the event loop (`checkpointInBackground`).
 */
export function checkpointAndClose(conn: Database.Database): void {
	const file = conn.name;
	conn.close();
	checkpointInBackground(file);
}
