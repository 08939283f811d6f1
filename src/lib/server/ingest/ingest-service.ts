import Database from 'better-sqlite3';
import { Worker } from 'node:worker_threads';
import {
	CANONICAL_PROFILE,
	addMeasureValue,
	emptyMeasureState,
	summariseMeasure,
	type BoardHeader,
	type IngestIssue,
	type MappingProfile,
	type MeasureState,
	type MeasureSummary,
	type SpiParseSummary,
	type SpiRowBatch
} from '$lib/ingest';
import type { Db } from '../db';
import { checkStoredStencil } from '../stencils/evaluation';
import { openArchiveWriter } from './archive';
import { reportProgress } from './progress';
import { publishFloorEvent } from '../floor/events';
import { inlineParseDriver, threadedParseDriver, type ParseDriver } from './parse-driver';

/** How a file came in. */
export type IngestSource = 'upload' | 'api' | 'watch';

/** One file to ingest. */
export interface IngestRequest {
	source: IngestSource;
	fileName: string;
	/** The file's bytes in order (a request body, a busboy part, a file stream). */
	body: AsyncIterable<Uint8Array>;
	/** Mapping profile (default: the canonical layout) and its stored id, if any. */
	profile?: MappingProfile;
	profileId?: number | null;
	/** "user:12", "token:3" or "system". */
	createdBy: string;
	userId?: number | null;
	/** For watched files: the path the file was found at. */
	sourcePath?: string | null;
	/** Declared size, for progress (content-length). */
	totalBytes?: number | null;
	/** Progress key (see `progress.ts`); progress is reported only when given. */
	job?: string | null;
	/** Parse on a worker thread: default for files of 8 MB or more (declared size). */
	threaded?: boolean;
	/** Rows per batch handed from the parser to the writer (tests use small ones). */
	batchSize?: number;
}

/** The verdict on one file, shaped like the API's answers. */
export type IngestOutcome =
	| {
			status: 'imported';
			id: number;
			boards: number;
			pads: number;
			rejectedRows: number;
			duplicateBoards: number;
			warnings: IngestIssue[];
			/** Whether the file was parsed on a worker thread. */
			threaded: boolean;
	  }
	| { status: 'duplicate'; id: number; attemptId: number }
	| { status: 'rejected'; id: number; errorCount: number; errors: IngestIssue[] };

/** Per-board facts resolved when the board first appears in a file. */
interface BoardSlot {
	/**
	 * spi_boards.id reserved for the board (its row is written by the final transaction), or 0
	 * when the inspection is already stored (its rows are skipped).
	 */
	id: number;
	/** The spi_boards row, less aggregates (written at the end). */
	row: (string | number | null)[];
	productCode: string;
	padKeys: PadMap;
	/** Aperture volume (µm³) and id by refdes\u0001pad for the board's stencil, if known. */
	apertures: Map<string, { id: number; volumeUm3: number }> | null;
	te: MeasureState;
	/** Volume % derived from µm³ when the file has no volume %. */
	derivedVolume: MeasureState;
}

/** Pad dictionary of one product: refdes → (pad, or pad + panel when panel > 0) → pad id. */
type PadMap = Map<string, Map<string, number>>;

const ROWS_PER_INSERT = 64;
/**
 * Pad rows written per short write transaction (~5-10 ms of work, so requests arriving meanwhile
 * wait at most that long: bench:responsive prints the figures). A transaction is opened and
 * committed within one turn of the event loop, never across an await, so other connections of
 * this process never find the database locked and other processes wait at most one chunk.
 */
const CHUNK_ROWS = 4096;
/** Board ids per delete transaction when a failed or interrupted import's rows are removed. */
const DISCARD_BOARDS_PER_STEP = 8;
/** How long a chunk waits, in all, for a write lock another process holds before giving up. */
const WRITE_LOCK_WAIT_MS = 30_000;
/** Below this declared size the worker's start-up (~0.1 s) costs more than it saves. */
const THREAD_MIN_BYTES = 8 * 1024 * 1024;

let queue: Promise<unknown> = Promise.resolve();
let warnedNoThread = false;

/**
 * Ingest one SPI file: stream it through the parser, write its pad measurements, pad dictionary
 * entries and boards, archive the original under its SHA-256, and record the import. A file with
 * a bad row (under the default policy), a file-level error or the same content as an earlier
 * import keeps nothing of its data; board inspections already stored (serial + inspected_at) are
 * skipped and counted. Imports run one at a time (a queue).
 *
 * Isolation without a long lock: pad rows are committed in short chunks (`CHUNK_ROWS`, each
 * transaction within one event-loop turn) against spi_boards ids this import reserves (recorded
 * on its spi_imports row, status 'importing'). Readers reach pad rows only through spi_boards, and
 * the board rows, new pad dictionary entries, per-board aggregates and the status 'imported' are
 * written in ONE final short transaction, so no reader ever sees part of an import. A rejected,
 * duplicate or failed file deletes its chunk rows (in chunks too); an import cut short by a
 * crash is cleaned up at start-up (`recoverInterruptedImports`). Other writers (sign-in, API
 * tokens, print runs) never wait for an import: no transaction stays open across an await.
 * @throws only for server faults (disk full, database closed); file content never throws.
 * @example
 * const outcome = await ingestSpiFile(db, { source: 'api', fileName: 'a.csv', body: stream, createdBy: 'user:1' });
 * outcome.status // 'imported' | 'duplicate' | 'rejected'
 */
export function ingestSpiFile(db: Db, request: IngestRequest): Promise<IngestOutcome> {
	const run = queue.then(() => ingestNow(db, request));
	queue = run.catch(() => undefined);
	return run;
}

/**
 * Why a second connection: its pragmas suit bulk appends, and its statements stay apart from the
 * request path's. A short busy timeout: within this process no transaction outlives one turn of
 * the event loop, so only another process can hold the lock, and `beginWrite` waits for that
 * without blocking the event loop.
 */
function openIngestConnection(db: Db): { conn: Database.Database; own: boolean } {
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
async function beginWrite(conn: Database.Database): Promise<void> {
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
async function inWriteTransaction<T>(conn: Database.Database, work: () => T): Promise<T> {
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

async function ingestNow(db: Db, request: IngestRequest): Promise<IngestOutcome> {
	const profile = request.profile ?? CANONICAL_PROFILE;
	const startedAt = Date.now();
	const { conn, own } = openIngestConnection(db);
	const archive = openArchiveWriter(db.$client.name);
	let sizeBytes = 0;
	let closeParser = () => Promise.resolve();
	let writer: BatchWriter | null = null;
	try {
		const parserOptions = {
			profile,
			fileName: request.fileName,
			batchSize: request.batchSize,
			archiveFd: archive.fd
		};
		// Large files parse on a worker thread while this thread inserts (see parse-driver.ts).
		let parser: ParseDriver | null = null;
		if (request.threaded ?? (request.totalBytes ?? 0) >= THREAD_MIN_BYTES) {
			parser = await threadedParseDriver(parserOptions);
			if (!parser && !warnedNoThread) {
				warnedNoThread = true;
				console.warn('[rollbead] SPI parser thread did not start; parsing in the main thread');
			}
		}
		parser ??= inlineParseDriver(parserOptions);
		closeParser = parser.close;
		const w = (writer = await inWriteTransaction(conn, () =>
			createBatchWriter(db, conn, request, startedAt)
		));
		let rows = 0;
		const progress = (phase: 'receiving' | 'finishing') => {
			if (!request.job) return;
			reportProgress({
				job: request.job,
				phase,
				fileName: request.fileName,
				bytes: sizeBytes,
				totalBytes: request.totalBytes ?? null,
				rows,
				boards: parser.boardsSeen()
			});
		};
		// Batches wait here until a chunk's worth is ready; then one short transaction writes them.
		const held: SpiRowBatch[] = [];
		let heldRows = 0;
		const writeHeld = async () => {
			while (held.length > 0) {
				// At most about CHUNK_ROWS per transaction, then a turn of the event loop for others.
				let take = 0;
				let taken = 0;
				while (take < held.length && (taken === 0 || taken + held[take].length <= CHUNK_ROWS)) {
					taken += held[take].length;
					take++;
				}
				const batches = held.splice(0, take);
				heldRows -= taken;
				await inWriteTransaction(conn, () => {
					for (const batch of batches) {
						w.write(batch);
						rows += batch.length;
					}
					w.flush();
					w.reserve();
				});
				if (held.length > 0) await new Promise((resolve) => setImmediate(resolve));
			}
		};
		const writeAll = async (batches: SpiRowBatch[]) => {
			for (const batch of batches) {
				held.push(batch);
				heldRows += batch.length;
			}
			if (heldRows >= CHUNK_ROWS) await writeHeld();
		};
		progress('receiving');
		let lastReport = 0;
		// A few chunks in flight keep both threads busy; the cap bounds memory.
		const inFlight: Promise<SpiRowBatch[]>[] = [];
		for await (const chunk of request.body) {
			const bytes = chunk instanceof Uint8Array ? chunk : new Uint8Array(chunk);
			sizeBytes += bytes.length;
			inFlight.push(parser.push(bytes));
			while (inFlight.length > (parser.threaded ? 2 : 0))
				await writeAll(await (inFlight.shift() as Promise<SpiRowBatch[]>));
			if (request.job && Date.now() - lastReport > 200) {
				lastReport = Date.now();
				progress('receiving');
			}
		}
		while (inFlight.length > 0) await writeAll(await (inFlight.shift() as Promise<SpiRowBatch[]>));
		await writeAll(await parser.end());
		await writeHeld();
		progress('finishing');
		const summary = await parser.summary();
		// Last request: the parser thread is then done with this file (and may take the next).
		const sha256 = await parser.digest();
		const writeFailure = w.failure();

		const earlierImport = () =>
			conn
				.prepare(`select id from spi_imports where sha256 = ? and status = 'imported'`)
				.pluck()
				.get(sha256) as number | undefined;
		let duplicateOf = earlierImport() ?? null;
		let stored: StoredImport | null = null;
		if (duplicateOf === null && summary.ok && !writeFailure) {
			// The one transaction that makes the import visible (a duplicate may have landed meanwhile).
			await beginWrite(conn);
			try {
				const state = conn
					.prepare(`select status from spi_imports where id = ?`)
					.pluck()
					.get(w.importId);
				// Cleaned up meanwhile (a second server started on this database): never half-commit.
				if (state !== 'importing') throw new Error('the import was cleaned up while it ran');
				duplicateOf = earlierImport() ?? null;
				if (duplicateOf === null) {
					stored = w.finish(summary);
					const archivePath = archive.commit(sha256);
					conn
						.prepare(
							`update spi_imports set status = 'imported', sha256 = ?, size_bytes = ?, finished_at = ?,
							 data_rows = ?, boards = ?, pads = ?, rejected_rows = ?, duplicate_boards = ?,
							 error_count = ?, errors = ?, warnings = ?, archive_path = ?,
							 board_id_from = null, board_id_to = null where id = ?`
						)
						.run(
							sha256,
							sizeBytes,
							Date.now(),
							summary.dataRows,
							stored.boards,
							stored.pads,
							summary.rowsRejected,
							stored.duplicateBoards,
							summary.errorCount,
							JSON.stringify(summary.errors),
							JSON.stringify(summary.warnings),
							archivePath,
							w.importId
						);
				}
				conn.exec(duplicateOf === null ? 'COMMIT' : 'ROLLBACK');
			} catch (err) {
				if (conn.inTransaction) conn.exec('ROLLBACK');
				throw err;
			}
		}

		if (stored) {
			finishProgress(request, sizeBytes, rows, w.importId, 'imported');
			publishFloorEvent({ kind: 'spi-import', importId: w.importId, boardIds: stored.boardIds });
			if (stored.boardIds.length > 0) {
				// Charts judge the new boards at once (it logs its own failures, never throws).
				const { evaluateSignalsAfterIngest } = await import('../spc/signals');
				await evaluateSignalsAfterIngest(db, stored.boardIds);
			}
			return {
				status: 'imported',
				id: w.importId,
				boards: stored.boards,
				pads: stored.pads,
				rejectedRows: summary.rowsRejected,
				duplicateBoards: stored.duplicateBoards,
				warnings: summary.warnings,
				threaded: parser.threaded
			};
		}

		// Nothing of this file stays: its chunk rows go first, then the row records the verdict.
		await discardImportRows(conn, w.importId);
		if (duplicateOf !== null) {
			archive.discard();
			recordVerdict(conn, w.importId, {
				status: 'duplicate',
				sha256,
				sizeBytes,
				summary,
				duplicateOf,
				archivePath: null,
				errors: []
			});
			finishProgress(request, sizeBytes, rows, duplicateOf, 'duplicate');
			return { status: 'duplicate', id: duplicateOf, attemptId: w.importId };
		}
		const archivePath = archive.commit(sha256);
		const errors = writeFailure ? [writeFailure, ...summary.errors] : summary.errors;
		recordVerdict(conn, w.importId, {
			status: 'rejected',
			sha256,
			sizeBytes,
			summary,
			duplicateOf: null,
			archivePath,
			errors: errors.slice(0, 100)
		});
		finishProgress(request, sizeBytes, rows, w.importId, 'rejected');
		return {
			status: 'rejected',
			id: w.importId,
			errorCount: summary.errorCount + (writeFailure ? 1 : 0),
			errors: errors.slice(0, 100)
		};
	} catch (err) {
		if (conn.inTransaction) conn.exec('ROLLBACK');
		// The parser thread writes the archive file: stop it before the file is closed.
		await closeParser();
		archive.discard();
		if (writer) {
			// A fault (disk full, closed database): remove what was written; if even that fails,
			// the row stays 'importing' and the next start-up removes it.
			try {
				await discardImportRows(conn, writer.importId);
				conn
					.prepare(`delete from spi_imports where id = ? and status = 'importing'`)
					.run(writer.importId);
			} catch (cleanupErr) {
				console.warn(
					'[rollbead] could not remove the rows of a failed SPI import (removed at the next start):',
					(cleanupErr as Error).message
				);
			}
		}
		throw err;
	} finally {
		await closeParser();
		if (own) setImmediate(() => checkpointAndClose(conn));
	}
}

/**
 * Delete the pad rows of an unfinished import (status 'importing'), a few boards per short
 * transaction with the event loop given back in between, and clear its reserved range. Board ids
 * that have a spi_boards row are never touched (they belong to a finished import).
 */
async function discardImportRows(conn: Database.Database, importId: number): Promise<void> {
	const range = conn
		.prepare(
			`select board_id_from as "from", board_id_to as "to" from spi_imports
			 where id = ? and status = 'importing'`
		)
		.get(importId) as { from: number | null; to: number | null } | undefined;
	if (!range || range.from === null || range.to === null || range.to < range.from) return;
	const deleteRows = conn.prepare(
		`delete from spi_pad_measurements where board_id between ? and ?
		 and board_id not in (select id from spi_boards where id between ? and ?)`
	);
	const shrink = conn.prepare(`update spi_imports set board_id_from = ? where id = ?`);
	for (let from = range.from; from <= range.to; from += DISCARD_BOARDS_PER_STEP) {
		const to = Math.min(range.to, from + DISCARD_BOARDS_PER_STEP - 1);
		await inWriteTransaction(conn, () => {
			deleteRows.run(from, to, from, to);
			// Progress is recorded with the deletes, so a crash part-way resumes where it stopped.
			shrink.run(to + 1, importId);
		});
		await new Promise((r) => setImmediate(r));
	}
}

/**
 * Remove what imports cut short by a stopped server left (status 'importing'): their pad rows
 * (in chunks) and their rows, which become 'rejected' with a message saying so (the file is
 * imported whole when sent again; a watched file still in its folder is picked up again).
 * Run at start-up, before any import starts. Returns how many imports were cleaned up.
 */
export async function recoverInterruptedImports(db: Db): Promise<number> {
	const conn = db.$client;
	const ids = conn
		.prepare(`select id from spi_imports where status = 'importing' order by id`)
		.pluck()
		.all() as number[];
	for (const id of ids) {
		await discardImportRows(conn, id);
		conn
			.prepare(
				`update spi_imports set status = 'rejected', finished_at = ?, error_count = 1, errors = ?,
				 board_id_from = null, board_id_to = null where id = ?`
			)
			.run(
				Date.now(),
				JSON.stringify([
					{
						row: 0,
						column: null,
						message:
							'The server stopped during this import; nothing of it was kept. Import the file again.'
					}
				]),
				id
			);
	}
	return ids.length;
}

/**
 * Copy the import's pages from the WAL into the database file, then close its connection. Runs
 * after the answer went out: the data is committed and readable from the WAL, and a large file
 * would otherwise make its caller wait for SQLite's housekeeping (the automatic checkpoint that
 * follows a big commit, turned off on this connection).
 */
function checkpointAndClose(conn: Database.Database): void {
	const file = conn.name;
	conn.close();
	// Copying 100 MB of pages takes a few hundred ms: done on a thread of its own (with its own
	// connection), so the event loop keeps answering; once it holds the checkpoint lock, the
	// automatic checkpoints of other connections skip instead of doing the copy themselves.
	let worker: Worker;
	try {
		worker = new Worker(CHECKPOINT_THREAD_CODE, { eval: true, workerData: { file } });
	} catch (err) {
		return checkpointInline(file, err);
	}
	worker.once('message', (outcome: { ok: boolean; error?: string }) => {
		if (!outcome.ok)
			console.warn('[rollbead] WAL checkpoint after an SPI import failed:', outcome.error);
	});
	worker.once('error', (err) => checkpointInline(file, err));
	worker.unref();
}

/** The checkpoint thread: plain CommonJS, so it runs the same under vitest and `node build`. */
const CHECKPOINT_THREAD_CODE = `
const { parentPort, workerData } = require('node:worker_threads');
const Database = require('better-sqlite3');
try {
	// Never create the file: the database may have been moved or removed meanwhile.
	const db = new Database(workerData.file, { fileMustExist: true });
	db.pragma('busy_timeout = 0');
	db.pragma('wal_checkpoint(PASSIVE)');
	db.close();
	parentPort.postMessage({ ok: true });
} catch (err) {
	parentPort.postMessage({ ok: false, error: String(err && err.message) });
}
`;

function checkpointInline(file: string, cause: unknown): void {
	console.warn('[rollbead] checkpoint thread did not start, checkpointing here:', String(cause));
	try {
		const db = new Database(file, { fileMustExist: true });
		db.pragma('wal_checkpoint(PASSIVE)');
		db.close();
	} catch (err) {
		console.warn('[rollbead] WAL checkpoint after an SPI import failed:', (err as Error).message);
	}
}

function finishProgress(
	request: IngestRequest,
	bytes: number,
	rows: number,
	importId: number,
	status: string
): void {
	if (!request.job) return;
	reportProgress({
		job: request.job,
		phase: 'done',
		fileName: request.fileName,
		bytes,
		totalBytes: request.totalBytes ?? bytes,
		rows,
		boards: 0,
		importId,
		status
	});
}

interface Verdict {
	status: 'rejected' | 'duplicate';
	sha256: string;
	sizeBytes: number;
	summary: SpiParseSummary;
	duplicateOf: number | null;
	archivePath: string | null;
	errors: IngestIssue[];
}

/** Record a rejected or duplicate file on its import row (after its chunk rows were deleted). */
function recordVerdict(conn: Database.Database, importId: number, v: Verdict): void {
	conn
		.prepare(
			`update spi_imports set sha256 = ?, size_bytes = ?, status = ?, duplicate_of_import_id = ?,
			 finished_at = ?, data_rows = ?, boards = 0, pads = 0, rejected_rows = ?,
			 duplicate_boards = 0, error_count = ?, errors = ?, warnings = ?, archive_path = ?,
			 board_id_from = null, board_id_to = null where id = ?`
		)
		.run(
			v.sha256,
			v.sizeBytes,
			v.status,
			v.duplicateOf,
			Date.now(),
			v.summary.dataRows,
			v.summary.rowsRejected,
			v.status === 'rejected' ? Math.max(v.summary.errorCount, v.errors.length) : 0,
			JSON.stringify(v.errors),
			JSON.stringify(v.summary.warnings),
			v.archivePath,
			importId
		);
}

/** Parse a print-run reference from a file: `17`, `#17`, `PR-17`, `run 17` → 17. */
function printRunNumber(ref: string): number | null {
	const m = /^(?:pr[-\s]?|run\s*|#)?(\d{1,12})$/i.exec(ref.trim());
	return m ? Number(m[1]) : null;
}

/** What the final transaction stored. */
interface StoredImport {
	boards: number;
	boardIds: number[];
	pads: number;
	duplicateBoards: number;
}

type BatchWriter = ReturnType<typeof createBatchWriter>;

/**
 * The write side of one import. `write` runs inside a chunk transaction: pad measurement rows
 * against board ids reserved for this import, pad dictionary ids taken in memory (new entries
 * are written at the end); `reserve` records the ids handed out; `finish` (in the final
 * transaction) writes the pad dictionary entries, the board rows with their aggregates and the
 * pad-aperture links. Call first inside a write transaction: it writes the 'importing' row.
 */
function createBatchWriter(
	db: Db,
	conn: Database.Database,
	request: IngestRequest,
	startedAt: number
) {
	// AUTOINCREMENT tables: the next id is past both the largest id and sqlite_sequence, so raising
	// sqlite_sequence reserves ids (nothing else can take them, even if this import never finishes).
	const nextIdOf = (table: string) =>
		Math.max(
			(conn.prepare(`select max(id) from ${table}`).pluck().get() as number | null) ?? 0,
			(conn.prepare(`select seq from sqlite_sequence where name = ?`).pluck().get(table) as
				number | undefined) ?? 0
		) + 1;
	const raiseSequence = (table: string, seq: number) => {
		const changed = conn
			.prepare(`update sqlite_sequence set seq = ? where name = ? and seq < ?`)
			.run(seq, table, seq).changes;
		if (changed === 0)
			conn
				.prepare(
					`insert into sqlite_sequence (name, seq) select ?, ? where not exists
					 (select 1 from sqlite_sequence where name = ?)`
				)
				.run(table, seq, table);
	};
	const firstBoardId = nextIdOf('spi_boards');
	let nextBoardId = firstBoardId;
	let reservedBoardId = firstBoardId - 1;
	let nextPadId = nextIdOf('spi_pads');
	let reservedPadId = nextPadId - 1;
	const importId = (
		conn
			.prepare(
				`insert into spi_imports (source, file_name, sha256, size_bytes, status, profile_id,
				 profile_name, created_by, user_id, source_path, started_at, finished_at,
				 board_id_from, board_id_to)
				 values (?, ?, '', 0, 'importing', ?, ?, ?, ?, ?, ?, ?, ?, ?) returning id`
			)
			.get(
				request.source,
				request.fileName,
				request.profileId ?? null,
				(request.profile ?? CANONICAL_PROFILE).name,
				request.createdBy,
				request.userId ?? null,
				request.sourcePath ?? null,
				startedAt,
				startedAt,
				firstBoardId,
				firstBoardId - 1
			) as { id: number }
	).id;
	const recordReservedBoards = conn.prepare(`update spi_imports set board_id_to = ? where id = ?`);

	const boardStored = conn
		.prepare(`select 1 from spi_boards where serial = ? and inspected_at = ?`)
		.pluck();
	/** New pad dictionary entries [id, product, panel, refdes, pad], written at the end. */
	const newPads: [number, string, number, string, string][] = [];
	const lineIdOf = conn.prepare(`select id from lines where code = ?`).pluck();
	const productIdOf = conn.prepare(`select id from products where code = ?`).pluck();
	const runById = conn.prepare(`select id, line_id, stencil_id from print_runs where id = ?`);
	const runByWindow = conn.prepare(
		`select id, stencil_id from print_runs where line_id = ? and started_at <= ?
		 and (ended_at is null or ended_at >= ?) order by started_at desc limit 1`
	);
	const stencilByName = conn
		.prepare(`select id from stencils where name = ? order by id desc limit 1`)
		.pluck();
	const padsOfProduct = conn
		.prepare(`select id, panel_index, refdes, pad from spi_pads where product_code = ?`)
		.raw();
	const linkPad = conn.prepare(`update spi_pads set aperture_id = ? where id = ?`);
	const MEASUREMENT_COLUMNS = `insert into spi_pad_measurements (board_id, pad_id,
		 volume_centi_pct, area_centi_pct, height_centi_um, offset_x_centi_um, offset_y_centi_um,
		 result, volume_um3) values `;
	const insertMeasurement = conn.prepare(`${MEASUREMENT_COLUMNS}(?, ?, ?, ?, ?, ?, ?, ?, ?)`);
	// Many rows per statement: the per-call cost of a prepared statement, not SQLite's b-tree
	// work, dominates narrow inserts (measured: 1M rows 2.35 s one by one, 1.09 s 50 at a time).
	const insertMany = conn.prepare(
		MEASUREMENT_COLUMNS + new Array(ROWS_PER_INSERT).fill('(?, ?, ?, ?, ?, ?, ?, ?, ?)').join(', ')
	);
	const pending = new Array<number | null>(ROWS_PER_INSERT * 9);
	const pendingLine = new Uint32Array(ROWS_PER_INSERT);
	const pendingRefdes = new Array<string>(ROWS_PER_INSERT);
	const pendingPad = new Array<string>(ROWS_PER_INSERT);
	const pendingPanel = new Uint16Array(ROWS_PER_INSERT);
	let pendingRows = 0;

	/** Write the buffered rows; on a key clash find the row by writing them one at a time. */
	function flush(): void {
		if (pendingRows === 0 || failure) return;
		const n = pendingRows;
		pendingRows = 0;
		if (n === ROWS_PER_INSERT) {
			try {
				insertMany.run(pending);
				pads += n;
				return;
			} catch (err) {
				// The statement failed as a whole (statement-level atomicity); locate the row below.
				if ((err as { code?: string }).code !== 'SQLITE_CONSTRAINT_PRIMARYKEY') throw err;
			}
		}
		for (let k = 0; k < n; k++) {
			try {
				insertMeasurement.run(pending.slice(k * 9, k * 9 + 9));
				pads++;
			} catch (err) {
				if ((err as { code?: string }).code !== 'SQLITE_CONSTRAINT_PRIMARYKEY') throw err;
				failure = {
					row: pendingLine[k],
					column: 'pad',
					message: `refdes ${pendingRefdes[k]} pad "${pendingPad[k]}" (panel ${pendingPanel[k]}) appears twice for the same board inspection`
				};
				return;
			}
		}
	}

	const cache = {
		lines: new Map<string, number | null>(),
		products: new Map<string, number | null>(),
		stencils: new Map<string, number | null>(),
		padKeys: new Map<string, PadMap>(),
		apertures: new Map<number, Map<string, { id: number; volumeUm3: number }> | null>()
	};
	const slots: BoardSlot[] = [];
	const linkedPads = new Map<number, number>();
	let pads = 0;
	let duplicateBoards = 0;
	let failure: IngestIssue | null = null;

	const cached = <K, V>(map: Map<K, V>, key: K, load: () => V): V => {
		if (map.has(key)) return map.get(key) as V;
		const v = load();
		map.set(key, v);
		return v;
	};

	function padKeysOf(productCode: string): PadMap {
		return cached(cache.padKeys, productCode, () => {
			const m: PadMap = new Map();
			for (const [id, panel, refdes, pad] of padsOfProduct.all(productCode) as [
				number,
				number,
				string,
				string
			][]) {
				let inner = m.get(refdes);
				if (!inner) m.set(refdes, (inner = new Map()));
				inner.set(panel === 0 ? pad : `${pad}\u0001${panel}`, id);
			}
			return m;
		});
	}

	function aperturesOf(stencilId: number | null) {
		if (stencilId === null) return null;
		return cached(cache.apertures, stencilId, () => {
			try {
				const check = checkStoredStencil(db, stencilId);
				const m = new Map<string, { id: number; volumeUm3: number }>();
				for (const a of check.apertures)
					m.set(`${a.refdes}\u0001${a.pad}`, { id: a.id, volumeUm3: a.volumeUm3 });
				return m;
			} catch {
				// A stencil that cannot be evaluated (bad geometry) links nothing; the import goes on.
				return null;
			}
		});
	}

	function openBoard(b: BoardHeader): BoardSlot {
		const lineId = cached(
			cache.lines,
			b.lineCode,
			() => (lineIdOf.get(b.lineCode) as number) ?? null
		);
		const productId = cached(
			cache.products,
			b.productCode,
			() => (productIdOf.get(b.productCode) as number) ?? null
		);
		let printRunId: number | null = null;
		let runStencilId: number | null = null;
		if (b.printRun !== null) {
			const n = printRunNumber(b.printRun);
			const run =
				n === null
					? undefined
					: (runById.get(n) as { id: number; stencil_id: number | null } | undefined);
			if (run) {
				printRunId = run.id;
				runStencilId = run.stencil_id;
			}
		} else if (lineId !== null) {
			const run = runByWindow.get(lineId, b.inspectedAtMs, b.inspectedAtMs) as
				{ id: number; stencil_id: number | null } | undefined;
			if (run) {
				printRunId = run.id;
				runStencilId = run.stencil_id;
			}
		}
		const named = b.stencil;
		const stencilId =
			named !== null
				? cached(cache.stencils, named, () => (stencilByName.get(named) as number) ?? null)
				: runStencilId;
		const stored = boardStored.get(b.boardSerial, b.inspectedAtMs) !== undefined;
		if (stored) duplicateBoards++;
		const id = stored ? 0 : nextBoardId++;
		return {
			id,
			row: [
				id,
				b.boardSerial,
				b.inspectedAtMs,
				b.lineCode,
				b.productCode,
				lineId,
				productId,
				importId,
				printRunId,
				stencilId,
				b.stencil,
				b.printRun
			],
			productCode: b.productCode,
			padKeys: padKeysOf(b.productCode),
			apertures: aperturesOf(stencilId),
			te: emptyMeasureState(),
			derivedVolume: emptyMeasureState()
		};
	}

	return {
		importId,
		failure: () => failure,
		/** Write one batch (nothing after the first write failure; the file is then rejected). */
		write(batch: SpiRowBatch): void {
			if (failure) return;
			for (const b of batch.newBoards) slots[b.index] = openBoard(b);
			const {
				boardIndex,
				refdes,
				pad,
				panelIndex,
				volumePct,
				areaPct,
				heightUm,
				offsetXUm,
				offsetYUm,
				volumeUm3,
				result,
				line
			} = batch;
			let lastRefdes = '';
			let lastPads: Map<string, number> | undefined;
			let lastSlot: BoardSlot | undefined;
			for (let i = 0; i < batch.length; i++) {
				const slot = slots[boardIndex[i]];
				if (slot.id === 0) continue;
				const r = refdes[i];
				const panel = panelIndex[i];
				const padKey = panel === 0 ? pad[i] : `${pad[i]}\u0001${panel}`;
				// Rows of one component follow each other: reuse its pad map while refdes repeats.
				if (slot !== lastSlot || r !== lastRefdes || lastPads === undefined) {
					lastPads = slot.padKeys.get(r);
					if (!lastPads) slot.padKeys.set(r, (lastPads = new Map()));
					lastRefdes = r;
					lastSlot = slot;
				}
				let padId = lastPads.get(padKey);
				if (padId === undefined) {
					padId = nextPadId++;
					newPads.push([padId, slot.productCode, panel, r, pad[i]]);
					lastPads.set(padKey, padId);
				}
				let vol = volumePct[i];
				const um3 = volumeUm3[i];
				if (slot.apertures !== null && (um3 === um3 || !linkedPads.has(padId))) {
					const ap = slot.apertures.get(`${r}\u0001${pad[i]}`);
					if (ap && um3 === um3 && ap.volumeUm3 > 0) {
						const te = um3 / ap.volumeUm3;
						addMeasureValue(slot.te, te);
						if (vol !== vol) {
							vol = te * 100;
							addMeasureValue(slot.derivedVolume, vol);
						}
					}
					if (ap && linkedPads.get(padId) !== ap.id) linkedPads.set(padId, ap.id);
				}
				const k = pendingRows;
				const o = k * 9;
				// Values passed the parser's range checks (finite, |x| ≤ 5000), so hundredths fit an
				// int32; `| 0` is encodeCentis's rounding without its checks and turns −0 into 0.
				pending[o] = slot.id;
				pending[o + 1] = padId;
				pending[o + 2] = vol === vol ? Math.round(vol * 100) | 0 : null;
				pending[o + 3] = Math.round(areaPct[i] * 100) | 0;
				pending[o + 4] = Math.round(heightUm[i] * 100) | 0;
				pending[o + 5] = Math.round(offsetXUm[i] * 100) | 0;
				pending[o + 6] = Math.round(offsetYUm[i] * 100) | 0;
				pending[o + 7] = result[i];
				pending[o + 8] = um3 === um3 ? Math.round(um3) : null;
				pendingLine[k] = line[i];
				pendingRefdes[k] = r;
				pendingPad[k] = pad[i];
				pendingPanel[k] = panel;
				pendingRows = k + 1;
				if (pendingRows === ROWS_PER_INSERT) {
					flush();
					if (failure) return;
				}
			}
		},
		/** Write rows still buffered (call before reading `failure()`). */
		flush,
		/**
		 * Reserve the board and pad ids handed out so far (in the open chunk transaction, with the
		 * rows that use them): raise sqlite_sequence and record the board range on the import row.
		 */
		reserve(): void {
			if (nextBoardId - 1 > reservedBoardId) {
				reservedBoardId = nextBoardId - 1;
				raiseSequence('spi_boards', reservedBoardId);
				recordReservedBoards.run(reservedBoardId, importId);
			}
			if (nextPadId - 1 > reservedPadId) {
				reservedPadId = nextPadId - 1;
				raiseSequence('spi_pads', reservedPadId);
			}
		},
		/**
		 * In the final transaction: the new pad dictionary entries, the board rows with their
		 * aggregates, and the pad-aperture links; returns what was stored. References that went
		 * away while the file streamed in (a print run, stencil or aperture deleted) are left empty
		 * rather than failing the import.
		 */
		finish(summary: SpiParseSummary): StoredImport {
			const insertPad = conn.prepare(
				`insert into spi_pads (id, product_code, panel_index, refdes, pad) values (?, ?, ?, ?, ?)`
			);
			for (const p of newPads) insertPad.run(p);
			const insertBoard = conn.prepare(
				`insert into spi_boards (id, serial, inspected_at, line_code, product_code, line_id,
				 product_id, import_id, print_run_id, stencil_id, stencil_name, print_run_ref,
				 pad_count, pass_count, warn_count, fail_count,
				 volume_pct_count, volume_pct_mean, volume_pct_sd, volume_pct_min, volume_pct_max, volume_pct_range,
				 area_pct_count, area_pct_mean, area_pct_sd, area_pct_min, area_pct_max, area_pct_range,
				 height_um_count, height_um_mean, height_um_sd, height_um_min, height_um_max, height_um_range,
				 offset_x_um_count, offset_x_um_mean, offset_x_um_sd, offset_x_um_min, offset_x_um_max, offset_x_um_range,
				 offset_y_um_count, offset_y_um_mean, offset_y_um_sd, offset_y_um_min, offset_y_um_max, offset_y_um_range,
				 te_count, te_mean, te_sd, te_min, te_max, te_range)
				 values (${new Array(52).fill('?').join(', ')})`
			);
			const exists = (table: string) => {
				const stmt = conn.prepare(`select 1 from ${table} where id = ?`).pluck();
				const seen = new Map<number, boolean>();
				return (id: number | null) =>
					id === null ? null : cached(seen, id, () => stmt.get(id) !== undefined) ? id : null;
			};
			const [lineOk, productOk, runOk, stencilOk, apertureOk] = [
				exists('lines'),
				exists('products'),
				exists('print_runs'),
				exists('stencils'),
				exists('apertures')
			];
			const cols = (s: MeasureSummary) => [s.count, s.mean, s.sd, s.min, s.max, s.range];
			const none = summariseMeasure(emptyMeasureState());
			const aggregates = new Map(summary.boards.map((b) => [b.index, b.aggregate]));
			const boardIds: number[] = [];
			for (let index = 0; index < slots.length; index++) {
				const slot = slots[index];
				if (!slot || slot.id === 0) continue;
				const row = slot.row;
				row[5] = lineOk(row[5] as number | null);
				row[6] = productOk(row[6] as number | null);
				row[8] = runOk(row[8] as number | null);
				row[9] = stencilOk(row[9] as number | null);
				const a = aggregates.get(index);
				if (!a) {
					// A board whose every row was skipped: stored with no figures, as it always was.
					insertBoard.run(...row, 0, 0, 0, 0, ...[0, 1, 2, 3, 4, 5].flatMap(() => cols(none)));
					continue;
				}
				boardIds.push(slot.id);
				const volume = a.volumePct.count === 0 ? summariseMeasure(slot.derivedVolume) : a.volumePct;
				insertBoard.run(
					...row,
					a.rows,
					a.results.pass,
					a.results.warn,
					a.results.fail,
					...cols(volume),
					...cols(a.areaPct),
					...cols(a.heightUm),
					...cols(a.offsetXUm),
					...cols(a.offsetYUm),
					...cols(summariseMeasure(slot.te))
				);
			}
			for (const [padId, apertureId] of linkedPads)
				if (apertureOk(apertureId) !== null) linkPad.run(apertureId, padId);
			return { boards: boardIds.length, boardIds, pads, duplicateBoards };
		}
	};
}
