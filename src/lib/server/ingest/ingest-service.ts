import Database from 'better-sqlite3';
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
	/** spi_boards.id, or 0 when the inspection is already stored (its rows are skipped). */
	id: number;
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
/** Below this declared size the worker's start-up (~0.1 s) costs more than it saves. */
const THREAD_MIN_BYTES = 8 * 1024 * 1024;

let queue: Promise<unknown> = Promise.resolve();
let warnedNoThread = false;

/**
 * Ingest one SPI file: stream it through the parser, write boards, pad dictionary entries and pad
 * measurements in ONE transaction on a dedicated connection, archive the original under its
 * SHA-256, and record the import. A file with a bad row (under the default policy), a file-level
 * error or the same content as an earlier import is rolled back whole; nothing of it stays.
 * Board inspections already stored (serial + inspected_at) are skipped and counted. Imports run
 * one at a time (a queue), so two files never wait on each other's write lock.
 *
 * Why a second connection: the transaction spans awaits (the body streams in), and on the shared
 * connection other requests' writes would land inside it. Other writers wait (busy timeout)
 * while an import commits; readers are never blocked (WAL).
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

function openIngestConnection(db: Db): { conn: Database.Database; own: boolean } {
	const file = db.$client.name;
	if (file === ':memory:' || db.$client.memory) return { conn: db.$client, own: false };
	const conn = new Database(file);
	conn.pragma('busy_timeout = 30000');
	conn.pragma('synchronous = NORMAL');
	conn.pragma('foreign_keys = ON');
	// Pad rows are appended in key order, so only the b-tree's right edge is hot: a small cache does.
	conn.pragma('cache_size = -8192');
	conn.pragma('temp_store = MEMORY');
	// Checkpointed after the answer (checkpointAndClose), not inside the commit.
	conn.pragma('wal_autocheckpoint = 0');
	return { conn, own: true };
}

async function ingestNow(db: Db, request: IngestRequest): Promise<IngestOutcome> {
	const profile = request.profile ?? CANONICAL_PROFILE;
	const startedAt = Date.now();
	const { conn, own } = openIngestConnection(db);
	const archive = openArchiveWriter(db.$client.name);
	let sizeBytes = 0;
	let inTransaction = false;
	let closeParser = () => Promise.resolve();
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
		conn.exec('BEGIN IMMEDIATE');
		inTransaction = true;
		const writer = createBatchWriter(db, conn, request, startedAt);
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
		const writeAll = (batches: SpiRowBatch[]) => {
			for (const batch of batches) {
				writer.write(batch);
				rows += batch.length;
			}
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
				writeAll(await (inFlight.shift() as Promise<SpiRowBatch[]>));
			if (request.job && Date.now() - lastReport > 200) {
				lastReport = Date.now();
				progress('receiving');
			}
		}
		while (inFlight.length > 0) writeAll(await (inFlight.shift() as Promise<SpiRowBatch[]>));
		writeAll(await parser.end());
		progress('finishing');
		writer.flush();
		const summary = await parser.summary();
		// Last request: the parser thread is then done with this file (and may take the next).
		const sha256 = await parser.digest();
		const writeFailure = writer.failure();

		const earlier = conn
			.prepare(`select id from spi_imports where sha256 = ? and status = 'imported'`)
			.get(sha256) as { id: number } | undefined;
		if (earlier) {
			conn.exec('ROLLBACK');
			inTransaction = false;
			archive.discard();
			const attemptId = recordVerdict(conn, request, profile, {
				status: 'duplicate',
				sha256,
				sizeBytes,
				startedAt,
				summary,
				duplicateOf: earlier.id,
				archivePath: null,
				errors: []
			});
			finishProgress(request, sizeBytes, rows, earlier.id, 'duplicate');
			return { status: 'duplicate', id: earlier.id, attemptId };
		}

		if (!summary.ok || writeFailure) {
			conn.exec('ROLLBACK');
			inTransaction = false;
			const archivePath = archive.commit(sha256);
			const errors = writeFailure ? [writeFailure, ...summary.errors] : summary.errors;
			const id = recordVerdict(conn, request, profile, {
				status: 'rejected',
				sha256,
				sizeBytes,
				startedAt,
				summary,
				duplicateOf: null,
				archivePath,
				errors: errors.slice(0, 100)
			});
			finishProgress(request, sizeBytes, rows, id, 'rejected');
			return {
				status: 'rejected',
				id,
				errorCount: summary.errorCount + (writeFailure ? 1 : 0),
				errors: errors.slice(0, 100)
			};
		}

		const stored = writer.finish(summary);
		const archivePath = archive.commit(sha256);
		conn
			.prepare(
				`update spi_imports set status = 'imported', sha256 = ?, size_bytes = ?, finished_at = ?,
				 data_rows = ?, boards = ?, pads = ?, rejected_rows = ?, duplicate_boards = ?,
				 error_count = ?, errors = ?, warnings = ?, archive_path = ? where id = ?`
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
				writer.importId
			);
		conn.exec('COMMIT');
		inTransaction = false;
		finishProgress(request, sizeBytes, rows, writer.importId, 'imported');
		if (stored.boardIds.length > 0) {
			// Charts judge the new boards at once (it logs its own failures, never throws).
			const { evaluateSignalsAfterIngest } = await import('../spc/signals');
			await evaluateSignalsAfterIngest(db, stored.boardIds);
		}
		return {
			status: 'imported',
			id: writer.importId,
			boards: stored.boards,
			pads: stored.pads,
			rejectedRows: summary.rowsRejected,
			duplicateBoards: stored.duplicateBoards,
			warnings: summary.warnings,
			threaded: parser.threaded
		};
	} catch (err) {
		if (inTransaction) conn.exec('ROLLBACK');
		// The parser thread writes the archive file: stop it before the file is closed.
		await closeParser();
		archive.discard();
		throw err;
	} finally {
		await closeParser();
		if (own) setImmediate(() => checkpointAndClose(conn));
	}
}

/**
 * Copy the import's pages from the WAL into the database file, then close its connection. Runs
 * after the answer went out: the data is committed and readable from the WAL, and a large file
 * would otherwise make its caller wait for SQLite's housekeeping (the automatic checkpoint that
 * follows a big commit, turned off on this connection).
 */
function checkpointAndClose(conn: Database.Database): void {
	try {
		conn.pragma('wal_checkpoint(PASSIVE)');
	} catch (err) {
		console.warn('[rollbead] WAL checkpoint after an SPI import failed:', (err as Error).message);
	} finally {
		conn.close();
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
	startedAt: number;
	summary: SpiParseSummary;
	duplicateOf: number | null;
	archivePath: string | null;
	errors: IngestIssue[];
}

/** Record a rejected or duplicate file (its own small transaction, after the rollback). */
function recordVerdict(
	conn: Database.Database,
	request: IngestRequest,
	profile: MappingProfile,
	v: Verdict
): number {
	const row = conn
		.prepare(
			`insert into spi_imports (source, file_name, sha256, size_bytes, status, duplicate_of_import_id,
			 profile_id, profile_name, created_by, user_id, source_path, started_at, finished_at,
			 data_rows, boards, pads, rejected_rows, duplicate_boards, error_count, errors, warnings,
			 archive_path)
			 values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 0, 0, ?, 0, ?, ?, ?, ?) returning id`
		)
		.get(
			request.source,
			request.fileName,
			v.sha256,
			v.sizeBytes,
			v.status,
			v.duplicateOf,
			request.profileId ?? null,
			profile.name,
			request.createdBy,
			request.userId ?? null,
			request.sourcePath ?? null,
			v.startedAt,
			Date.now(),
			v.summary.dataRows,
			v.summary.rowsRejected,
			v.status === 'rejected' ? Math.max(v.summary.errorCount, v.errors.length) : 0,
			JSON.stringify(v.errors),
			JSON.stringify(v.summary.warnings),
			v.archivePath
		) as { id: number };
	return row.id;
}

/** Parse a print-run reference from a file: `17`, `#17`, `PR-17`, `run 17` → 17. */
function printRunNumber(ref: string): number | null {
	const m = /^(?:pr[-\s]?|run\s*|#)?(\d{1,12})$/i.exec(ref.trim());
	return m ? Number(m[1]) : null;
}

/**
 * The write side of one import, inside the open transaction: board rows when a board first
 * appears, pad dictionary ids, pad measurement rows, and aggregates at the end.
 */
function createBatchWriter(
	db: Db,
	conn: Database.Database,
	request: IngestRequest,
	startedAt: number
) {
	const importId = (
		conn
			.prepare(
				`insert into spi_imports (source, file_name, sha256, size_bytes, status, profile_id,
				 profile_name, created_by, user_id, source_path, started_at, finished_at)
				 values (?, ?, '', 0, 'importing', ?, ?, ?, ?, ?, ?, ?) returning id`
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
				startedAt
			) as { id: number }
	).id;

	const insertBoard = conn.prepare(
		`insert into spi_boards (serial, inspected_at, line_code, product_code, line_id, product_id,
		 import_id, print_run_id, stencil_id, stencil_name, print_run_ref, pad_count, pass_count,
		 warn_count, fail_count)
		 values (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, 0, 0, 0, 0)
		 on conflict (serial, inspected_at) do nothing returning id`
	);
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
	const insertPad = conn
		.prepare(
			`insert into spi_pads (product_code, panel_index, refdes, pad) values (?, ?, ?, ?) returning id`
		)
		.pluck();
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
		const row = insertBoard.get(
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
		) as { id: number } | undefined;
		if (!row) duplicateBoards++;
		return {
			id: row?.id ?? 0,
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
					padId = insertPad.get(slot.productCode, panel, r, pad[i]) as number;
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
		/** Write the per-board aggregates and pad links; returns what was stored. */
		finish(summary: SpiParseSummary) {
			const update = conn.prepare(
				`update spi_boards set pad_count = ?, pass_count = ?, warn_count = ?, fail_count = ?,
				 volume_pct_count = ?, volume_pct_mean = ?, volume_pct_sd = ?, volume_pct_min = ?, volume_pct_max = ?, volume_pct_range = ?,
				 area_pct_count = ?, area_pct_mean = ?, area_pct_sd = ?, area_pct_min = ?, area_pct_max = ?, area_pct_range = ?,
				 height_um_count = ?, height_um_mean = ?, height_um_sd = ?, height_um_min = ?, height_um_max = ?, height_um_range = ?,
				 offset_x_um_count = ?, offset_x_um_mean = ?, offset_x_um_sd = ?, offset_x_um_min = ?, offset_x_um_max = ?, offset_x_um_range = ?,
				 offset_y_um_count = ?, offset_y_um_mean = ?, offset_y_um_sd = ?, offset_y_um_min = ?, offset_y_um_max = ?, offset_y_um_range = ?,
				 te_count = ?, te_mean = ?, te_sd = ?, te_min = ?, te_max = ?, te_range = ?
				 where id = ?`
			);
			const cols = (s: MeasureSummary) => [s.count, s.mean, s.sd, s.min, s.max, s.range];
			const boardIds: number[] = [];
			for (const b of summary.boards) {
				const slot = slots[b.index];
				if (!slot || slot.id === 0) continue;
				boardIds.push(slot.id);
				const a = b.aggregate;
				const volume = a.volumePct.count === 0 ? summariseMeasure(slot.derivedVolume) : a.volumePct;
				update.run(
					a.rows,
					a.results.pass,
					a.results.warn,
					a.results.fail,
					...cols(volume),
					...cols(a.areaPct),
					...cols(a.heightUm),
					...cols(a.offsetXUm),
					...cols(a.offsetYUm),
					...cols(summariseMeasure(slot.te)),
					slot.id
				);
			}
			for (const [padId, apertureId] of linkedPads) linkPad.run(apertureId, padId);
			return { boards: boardIds.length, boardIds, pads, duplicateBoards };
		}
	};
}
