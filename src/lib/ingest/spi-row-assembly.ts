/**
 * Row assembly of the SPI parser: checked rows grouped into board inspections (serial + time;
 * line, product, stencil and print run must agree within one), per-board aggregates, and the
 * struct-of-arrays batches handed to the writer. Also the bad-row policy: under `reject-file`
 * nothing is handed out after the first bad row.
 */
import {
	createBoardAccumulator,
	type BoardAccumulator,
	type BoardAggregate
} from './board-accumulator';
import type { IngestIssue } from './ingest-issue';
import { SPI_PARSE_LIMIT_ENV } from './parse-limits';
import {
	boardInspectionKey,
	createSpiRowBatch,
	trimSpiRowBatch,
	type BoardHeader,
	type SpiRowBatch
} from './spi-row-batch';
import { detach, type CheckedRow } from './spi-row-validation';

/** Options of `createRowAssembler`. */
export interface RowAssemblerOptions {
	/** Rows per emitted batch. */
	batchSize: number;
	/** Most board inspections in the file (each is held until the end). */
	maxBoards: number;
	/** `skip-row` policy: bad rows are skipped instead of stopping the batches. */
	skipRows: boolean;
	/**
	 * Report a board-level value of `row` that differs from its board's first row, on the column
	 * of `field` (row errors; the row is then rejected).
	 */
	conflict(row: number, field: 'line' | 'product' | 'stencil' | 'print_run', message: string): void;
	/** The board limit was passed: a file-level error (the caller stops reading). */
	tooManyBoards(issue: Omit<IngestIssue, 'column'>): void;
}

/** Groups checked rows into boards and batches. */
export interface RowAssembler {
	/** Add a row that passed its cell checks (it may still be rejected by its board). */
	accept(row: CheckedRow): void;
	/** Count a bad row; under `reject-file` the first one stops the batches. */
	reject(): void;
	/** Hand out the batch being filled, if it holds anything. */
	flush(): void;
	/** Batches completed since the last call. */
	take(): SpiRowBatch[];
	/** Boards seen so far (append-only; index = `BoardHeader.index`). */
	readonly boards: readonly BoardHeader[];
	/** Aggregates of every board so far, in board order. */
	aggregates(): BoardAggregate[];
	readonly rowsAccepted: number;
	readonly rowsRejected: number;
	/** A bad row was found under `reject-file`: nothing more is handed out. */
	readonly rejected: boolean;
}

/**
 * Create the row assembly of one file.
 * @example
 * const rows = createRowAssembler({ batchSize: 8192, maxBoards: 50_000, skipRows: false, conflict, tooManyBoards });
 * rows.accept(checked); rows.flush(); rows.take()[0].length // 1
 */
export function createRowAssembler(options: RowAssemblerOptions): RowAssembler {
	const { batchSize, maxBoards, skipRows } = options;
	let out: SpiRowBatch[] = [];
	let batch = createSpiRowBatch(batchSize);
	const boardList: BoardHeader[] = [];
	const accumulators: BoardAccumulator[] = [];
	const boardByKey = new Map<string, number>();
	let rowsAccepted = 0;
	let rowsRejected = 0;
	let rejected = false;
	let full = false;
	// Rows of a board are usually contiguous: the last board is checked before building a map key.
	let lastBoardSerial = '';
	let lastBoardMs = NaN;
	let lastBoardIndex = -1;

	function flush(): void {
		if (batch.length > 0 || batch.newBoards.length > 0) {
			out.push(trimSpiRowBatch(batch));
			batch = createSpiRowBatch(batchSize);
		}
	}

	function reject(): void {
		rowsRejected++;
		if (!skipRows && !rejected) {
			rejected = true;
			// Nothing more is handed out; the caller rolls back what it has.
			batch = createSpiRowBatch(1);
		}
	}

	// Error path only (building the message costs a Date and several strings).
	function reportConflict(b: BoardHeader, r: CheckedRow): void {
		const of = `than earlier rows of board ${b.boardSerial} inspected ${new Date(b.inspectedAtMs).toISOString()}`;
		if (b.lineCode !== r.lineCode)
			options.conflict(r.line, 'line', `line "${r.lineCode}" differs from "${b.lineCode}" ${of}`);
		if (b.productCode !== r.productCode) {
			options.conflict(
				r.line,
				'product',
				`product "${r.productCode}" differs from "${b.productCode}" ${of}`
			);
		}
		if ((b.stencil ?? '') !== r.stencil) {
			options.conflict(
				r.line,
				'stencil',
				`stencil "${r.stencil}" differs from "${b.stencil ?? ''}" ${of}`
			);
		}
		if ((b.printRun ?? '') !== r.printRun) {
			options.conflict(
				r.line,
				'print_run',
				`print_run "${r.printRun}" differs from "${b.printRun ?? ''}" ${of}`
			);
		}
	}

	function accept(r: CheckedRow): void {
		const serial = r.boardSerial;
		const inspectedAtMs = r.inspectedAtMs;
		let boardIndex: number | undefined;
		if (serial === lastBoardSerial && inspectedAtMs === lastBoardMs) {
			boardIndex = lastBoardIndex;
		} else {
			boardIndex = boardByKey.get(boardInspectionKey(serial, inspectedAtMs));
		}
		if (boardIndex !== undefined) {
			const b = boardList[boardIndex];
			if (
				b.lineCode !== r.lineCode ||
				b.productCode !== r.productCode ||
				(b.stencil ?? '') !== r.stencil ||
				(b.printRun ?? '') !== r.printRun
			) {
				reportConflict(b, r);
				reject();
				return;
			}
		}
		if (boardIndex === undefined && !rejected && boardList.length >= maxBoards) {
			// Every board is held until the end of the file: stop before memory runs out.
			full = true;
			rowsRejected++;
			options.tooManyBoards({
				row: r.line,
				message: `board inspection ${serial} is one more than the limit of ${maxBoards} per file (${SPI_PARSE_LIMIT_ENV.maxBoards}); split the export`
			});
			return;
		}
		rowsAccepted++;
		if (rejected || full) return;
		if (boardIndex === undefined) {
			boardIndex = boardList.length;
			// Board fields live until the end of the file: copy them off the chunk they were cut from.
			const board: BoardHeader = {
				index: boardIndex,
				boardSerial: detach(serial),
				inspectedAtMs,
				lineCode: detach(r.lineCode),
				productCode: detach(r.productCode),
				stencil: r.stencil === '' ? null : detach(r.stencil),
				printRun: r.printRun === '' ? null : detach(r.printRun),
				firstLine: r.line
			};
			boardList.push(board);
			accumulators.push(createBoardAccumulator());
			boardByKey.set(boardInspectionKey(board.boardSerial, inspectedAtMs), boardIndex);
			batch.newBoards.push(board);
		}
		lastBoardSerial = serial;
		lastBoardMs = inspectedAtMs;
		lastBoardIndex = boardIndex;
		accumulators[boardIndex].addMeasures(
			r.volumePct,
			r.areaPct,
			r.heightUm,
			r.offsetXUm,
			r.offsetYUm,
			r.result
		);
		const i = batch.length;
		batch.line[i] = r.line;
		batch.boardIndex[i] = boardIndex;
		batch.panelIndex[i] = r.panelIndex;
		batch.refdes[i] = r.refdes;
		batch.pad[i] = r.pad;
		batch.volumePct[i] = r.volumePct;
		batch.areaPct[i] = r.areaPct;
		batch.heightUm[i] = r.heightUm;
		batch.offsetXUm[i] = r.offsetXUm;
		batch.offsetYUm[i] = r.offsetYUm;
		batch.volumeUm3[i] = r.volumeUm3;
		batch.result[i] = r.result;
		batch.length = i + 1;
		if (batch.length === batchSize) flush();
	}

	return {
		accept,
		reject,
		flush,
		take() {
			const done = out;
			out = [];
			return done;
		},
		boards: boardList,
		aggregates: () => accumulators.map((a) => a.finish()),
		get rowsAccepted() {
			return rowsAccepted;
		},
		get rowsRejected() {
			return rowsRejected;
		},
		get rejected() {
			return rejected;
		}
	};
}
