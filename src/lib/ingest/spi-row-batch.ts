import type { ResultCode } from './board-accumulator';

/**
 * One board inspection found in a file: a board serial inspected at one instant. Its key is
 * serial + inspectedAtMs (`boardInspectionKey`), so rows of several boards may be interleaved.
 */
export interface BoardHeader {
	/** 0-based index within the file, in order of first appearance; rows point to it. */
	index: number;
	boardSerial: string;
	/** Inspection time, epoch milliseconds (UTC). */
	inspectedAtMs: number;
	lineCode: string;
	productCode: string;
	/** Stencil id, or null when the file has no stencil column or the cell is empty. */
	stencil: string | null;
	/** Print run id, or null when absent. */
	printRun: string | null;
	/** File line of the board's first row. */
	firstLine: number;
}

/**
 * A batch of accepted pad rows in struct-of-arrays form: row i of the batch is `line[i]`,
 * `boardIndex[i]`, `refdes[i]`, … for i < `length`. Typed arrays avoid one object per row and
 * feed prepared-statement loops directly. Arrays are owned by the batch (not reused), so the
 * consumer may keep them (but `refdes`/`pad` strings may share memory with the decoded chunk:
 * write them out, don't hoard batches). `volumeUm3` and, in absolute volume modes,
 * `volumePct` hold NaN when the value is absent (store as NULL). Values are in canonical units
 * (%, µm, µm³).
 */
export interface SpiRowBatch {
	length: number;
	/** File line number of each row (header = 1). */
	line: Uint32Array;
	/** Index into the file's board list (`BoardHeader.index`). */
	boardIndex: Uint32Array;
	panelIndex: Uint16Array;
	refdes: string[];
	pad: string[];
	volumePct: Float64Array;
	areaPct: Float64Array;
	heightUm: Float64Array;
	offsetXUm: Float64Array;
	offsetYUm: Float64Array;
	volumeUm3: Float64Array;
	/** 0 pass, 1 warn, 2 fail. */
	result: Uint8Array;
	/** Boards whose first accepted row is in this batch (insert them before the rows). */
	newBoards: BoardHeader[];
}

/** One parsed pad row as a plain object (convenient form of a batch row). */
export interface SpiRow {
	line: number;
	boardSerial: string;
	inspectedAtMs: number;
	lineCode: string;
	productCode: string;
	panelIndex: number;
	refdes: string;
	pad: string;
	volumePct: number;
	areaPct: number;
	heightUm: number;
	offsetXUm: number;
	offsetYUm: number;
	result: ResultCode;
	volumeUm3?: number;
	stencil?: string;
	printRun?: string;
}

/**
 * Allocate an empty batch with room for `capacity` rows.
 * @throws RangeError when `capacity` is not a positive integer.
 * @example createSpiRowBatch(4).line.length // 4
 */
export function createSpiRowBatch(capacity: number): SpiRowBatch {
	if (!Number.isInteger(capacity) || capacity < 1) {
		throw new RangeError(`createSpiRowBatch requires a positive integer capacity, got ${capacity}`);
	}
	return {
		length: 0,
		line: new Uint32Array(capacity),
		boardIndex: new Uint32Array(capacity),
		panelIndex: new Uint16Array(capacity),
		refdes: [],
		pad: [],
		volumePct: new Float64Array(capacity),
		areaPct: new Float64Array(capacity),
		heightUm: new Float64Array(capacity),
		offsetXUm: new Float64Array(capacity),
		offsetYUm: new Float64Array(capacity),
		volumeUm3: new Float64Array(capacity),
		result: new Uint8Array(capacity),
		newBoards: []
	};
}

/**
 * Cut a batch's typed arrays to its length (views, no copy). Used before handing it out.
 * @example trimSpiRowBatch(createSpiRowBatch(8)).line.length // 0
 */
export function trimSpiRowBatch(batch: SpiRowBatch): SpiRowBatch {
	const n = batch.length;
	return {
		...batch,
		line: batch.line.subarray(0, n),
		boardIndex: batch.boardIndex.subarray(0, n),
		panelIndex: batch.panelIndex.subarray(0, n),
		volumePct: batch.volumePct.subarray(0, n),
		areaPct: batch.areaPct.subarray(0, n),
		heightUm: batch.heightUm.subarray(0, n),
		offsetXUm: batch.offsetXUm.subarray(0, n),
		offsetYUm: batch.offsetYUm.subarray(0, n),
		volumeUm3: batch.volumeUm3.subarray(0, n),
		result: batch.result.subarray(0, n)
	};
}

/**
 * Expand a batch into row objects, looking boards up in `boards` (the parser's `boards()`).
 * Convenient for tests and small files; the ingest service should read the columns directly.
 * @throws Error when a row points to a board missing from `boards`.
 * @example batchToRows(batch, parser.boards())[0].boardSerial // 'RB-TESTBOARD-0001'
 */
export function batchToRows(batch: SpiRowBatch, boards: readonly BoardHeader[]): SpiRow[] {
	const rows: SpiRow[] = [];
	for (let i = 0; i < batch.length; i++) {
		const board = boards[batch.boardIndex[i]];
		if (!board)
			throw new Error(
				`batch row ${i} (line ${batch.line[i]}) points to unknown board ${batch.boardIndex[i]}`
			);
		const row: SpiRow = {
			line: batch.line[i],
			boardSerial: board.boardSerial,
			inspectedAtMs: board.inspectedAtMs,
			lineCode: board.lineCode,
			productCode: board.productCode,
			panelIndex: batch.panelIndex[i],
			refdes: batch.refdes[i],
			pad: batch.pad[i],
			volumePct: batch.volumePct[i],
			areaPct: batch.areaPct[i],
			heightUm: batch.heightUm[i],
			offsetXUm: batch.offsetXUm[i],
			offsetYUm: batch.offsetYUm[i],
			result: batch.result[i] as ResultCode
		};
		if (!Number.isNaN(batch.volumeUm3[i])) row.volumeUm3 = batch.volumeUm3[i];
		if (board.stencil !== null) row.stencil = board.stencil;
		if (board.printRun !== null) row.printRun = board.printRun;
		rows.push(row);
	}
	return rows;
}

/**
 * Key of a board inspection: serial and inspection instant. Used to group rows into boards.
 * @example boardInspectionKey('RB-1', 0) // 'RB-1\u00010'
 */
export function boardInspectionKey(boardSerial: string, inspectedAtMs: number): string {
	return `${boardSerial}\u0001${inspectedAtMs}`;
}
