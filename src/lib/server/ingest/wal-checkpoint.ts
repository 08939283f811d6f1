/**
 * The WAL checkpoint after an import: copies its pages from the WAL into the database file once
 * the answer went out, so a large file does not make its caller wait for SQLite's housekeeping
 * (the automatic checkpoint that follows a big commit is turned off on the ingest connection).
 */
import Database from 'better-sqlite3';
import { Worker } from 'node:worker_threads';

/**
 * One passive checkpoint of `file` on a connection of its own; the error message, or null.
 * The one checkpoint of the ingest: the thread runs this very function (its source is the
 * thread's code, so it must use nothing but its arguments) and so does the fallback here.
 * @example checkpointWal(Database, 'data/rollbead.db') // null
 */
export function checkpointWal(Sqlite: typeof Database, file: string): string | null {
	try {
		// Never create the file: the database may have been moved or removed meanwhile.
		const db = new Sqlite(file, { fileMustExist: true });
		try {
			db.pragma('busy_timeout = 0');
			db.pragma('wal_checkpoint(PASSIVE)');
		} finally {
			db.close();
		}
		return null;
	} catch (err) {
		return String(err && (err as Error).message);
	}
}

/** The checkpoint thread: plain CommonJS, so it runs the same under vitest and `node build`. */
const CHECKPOINT_THREAD_CODE = `
const { parentPort, workerData } = require('node:worker_threads');
const checkpointWal = ${checkpointWal.toString()};
parentPort.postMessage({ error: checkpointWal(require('better-sqlite3'), workerData.file) });
`;

function warnFailed(error: string | null): void {
	if (error === null) return;
	// The database was moved or removed meanwhile (a test's temp folder): nothing to checkpoint.
	if (/does not exist/.test(error)) return;
	console.warn('[rollbead] WAL checkpoint after an SPI import failed:', error);
}

/**
 * Checkpoint `file` on a thread of its own (with its own connection), so the event loop keeps
 * answering while 100 MB of pages are copied (a few hundred ms); once that thread holds the
 * checkpoint lock, the automatic checkpoints of other connections skip instead of doing the copy
 * themselves. When no thread starts, the checkpoint runs here. Failures are logged, never thrown.
 */
export function checkpointInBackground(file: string): void {
	const inline = (cause: unknown) => {
		console.warn('[rollbead] checkpoint thread did not start, checkpointing here:', String(cause));
		warnFailed(checkpointWal(Database, file));
	};
	let worker: Worker;
	try {
		worker = new Worker(CHECKPOINT_THREAD_CODE, { eval: true, workerData: { file } });
	} catch (err) {
		return inline(err);
	}
	worker.once('message', (outcome: { error: string | null }) => warnFailed(outcome.error));
	worker.once('error', inline);
	worker.unref();
}
