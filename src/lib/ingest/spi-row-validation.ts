/**
 * Validation of the SPI parser: one record's cells checked strictly and turned into canonical
 * values (numbers by `parseDecimal` after unit conversion to µm / µm³ and `FIELD_RANGES`,
 * timestamps by the profile's format, result words, panel index 0–65535, text ≤ 100 characters).
 * Every problem becomes an issue naming the file line, the column as written and the field.
 */
import { toCubicMicrometres, toMicrometres } from '../units';
import type { ResultCode } from './board-accumulator';
import { FIELD_RANGES, MAX_TEXT_LENGTH, type CanonicalField } from './canonical-fields';
import type { IssueCollector } from './ingest-issue';
import type { MappingProfile } from './mapping-profile';
import { parseDecimal } from './parse-decimal';
import { PAD_MEASURES } from '../spi/measures';
import type { SpiColumns } from './spi-field-map';
import type { SpiCells } from './spi-tokenizer';

/**
 * A row that passed its cell checks, in canonical units. Board-level values (serial, time, line,
 * product, stencil, print run) are grouped into board inspections by the row assembly. Empty
 * stencil / print run are ''; absent volumes are NaN.
 */
export interface CheckedRow {
	/** File line of the row (header = 1). */
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
	volumeUm3: number;
	result: ResultCode;
	stencil: string;
	printRun: string;
}

/**
 * An empty row to be filled by `RowValidator.check` (one per parser, reused row after row so
 * the hot loop allocates nothing).
 * @example emptyCheckedRow().volumeUm3 // NaN
 */
export function emptyCheckedRow(): CheckedRow {
	return {
		line: 0,
		boardSerial: '',
		inspectedAtMs: NaN,
		lineCode: '',
		productCode: '',
		panelIndex: 0,
		refdes: '',
		pad: '',
		volumePct: NaN,
		areaPct: NaN,
		heightUm: NaN,
		offsetXUm: NaN,
		offsetYUm: NaN,
		volumeUm3: NaN,
		result: 0,
		stencil: '',
		printRun: ''
	};
}

/**
 * A copy of `s` that does not share memory with the string it was cut from. V8 represents
 * `slice` results of 13+ characters as views on the parent (here a 64 KiB chunk), so a board
 * serial kept to the end would pin its whole chunk and memory would grow with file size.
 * Concatenating then slicing forces a fresh flat string.
 * @example detach('RB-0001') // 'RB-0001'
 */
export function detach(s: string): string {
	return s.length < 13 ? s : (' ' + s).slice(1);
}

/**
 * `s` without the ASCII spaces around it (the only padding numbers and timestamps may have).
 * @example trimSpaces(' 12 ') // '12'
 */
export function trimSpaces(s: string): string {
	let a = 0;
	let b = s.length;
	while (a < b && s.charCodeAt(a) === 32) a++;
	while (b > a && s.charCodeAt(b - 1) === 32) b--;
	return a === 0 && b === s.length ? s : s.slice(a, b);
}

// Characters a reader cannot see or tell apart from a space: shown as \uXXXX in messages.
const INVISIBLE =
	/[\u0000-\u001f\u007f-\u00a0\u00ad\u2000-\u200f\u2028-\u202f\u205f-\u206f\u3000\ufeff]/g;

/**
 * A cell in double quotes for an error message, with invisible characters (tab, no-break space,
 * zero-width space…) spelled out, so `"\u00a012"` is not shown as a plain `"12"`. At most 60
 * characters of it are shown.
 * @example quoteCell('\u00a012') // '"\\u00A012"'
 */
export function quoteCell(raw: string): string {
	const shown = raw.length > 60 ? raw.slice(0, 60) + '…' : raw;
	const spelled = shown.replace(
		INVISIBLE,
		(c) => '\\u' + c.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')
	);
	return `"${spelled}"`;
}

/**
 * Non-negative integer of 1–5 plain digits in text[start, end), spaces around allowed; else NaN.
 * @example readIndex('a 12 ', 1, 5) // 12
 */
export function readIndex(text: string, start: number, end: number): number {
	while (start < end && text.charCodeAt(start) === 32) start++;
	while (end > start && text.charCodeAt(end - 1) === 32) end--;
	if (end === start || end - start > 5) return NaN;
	let value = 0;
	for (let i = start; i < end; i++) {
		const c = text.charCodeAt(i);
		if (c < 48 || c > 57) return NaN;
		value = value * 10 + (c - 48);
	}
	return value;
}

function rangeText(field: keyof typeof FIELD_RANGES, unit: string): string {
	const r = FIELD_RANGES[field];
	return `${r.min} to ${r.max}${unit}`;
}

const RESULT_CODES = { pass: 0, warn: 1, fail: 2 } as const;
/** Unit of each pad measure in range messages (' %', ' µm'), from the measure catalogue. */
const UNIT = Object.fromEntries(PAD_MEASURES.map((m) => [m.field, ` ${m.unit}`])) as Record<
	(typeof PAD_MEASURES)[number]['field'],
	string
>;
const VOLUME_MIN = FIELD_RANGES.volume_pct.min;
const VOLUME_MAX = FIELD_RANGES.volume_pct.max;
const AREA_MIN = FIELD_RANGES.area_pct.min;
const AREA_MAX = FIELD_RANGES.area_pct.max;
const HEIGHT_MIN = FIELD_RANGES.height_um.min;
const HEIGHT_MAX = FIELD_RANGES.height_um.max;
const OFFSET_MIN = FIELD_RANGES.offset_x_um.min;
const OFFSET_MAX = FIELD_RANGES.offset_x_um.max;
const VOLUME_UM3_MAX = FIELD_RANGES.volume_um3.max;
const PANEL_MAX = FIELD_RANGES.panel_index.max;

/** Options of `createRowValidator`. */
export interface RowValidatorOptions {
	profile: MappingProfile;
	/** Header names as written (for the column of each issue). */
	names: readonly string[];
	columns: SpiColumns;
	/** Serial taken from the file name, when the profile says so. */
	serialFromName: string | null;
	/** Parses a timestamp cell to epoch ms, NaN when it is not one (`createTimestampParser`). */
	parseTime: (text: string) => number;
	errors: IssueCollector;
	/** How many issues `errors` keeps (kept messages are detached from their chunk). */
	issueLimit: number;
}

/** Checks records of one file. */
export interface RowValidator {
	/**
	 * Check every cell of one record (all its errors are reported, not just the first) and fill
	 * `out`; false when the row has an error. The record must have the header's field count.
	 */
	check(cells: SpiCells, row: number, out: CheckedRow): boolean;
	/** Report an error on column `index` of `row` (-1: the row as a whole). */
	bad(row: number, index: number, message: string): void;
}

/**
 * Create the validator for a file whose header has been mapped. Cells are read in place (no
 * substring per cell) and a cell equal to the previous row's reuses its value: that keeps the
 * garbage collector out of the hot loop.
 * @example
 * const v = createRowValidator({ profile, names, columns, serialFromName: null, parseTime, errors, issueLimit: 100 });
 * v.check(cells, 2, row) // true when line 2 is valid
 */
export function createRowValidator(options: RowValidatorOptions): RowValidator {
	const { profile, names, columns, serialFromName, parseTime, errors, issueLimit } = options;
	const decimalComma = profile.decimalComma;
	const lengthFactor = toMicrometres(1, profile.lengthUnit);
	const volumeFactor = profile.volumeMode === 'absolute-mil3' ? toCubicMicrometres(1, 'mil') : 1;
	// Absolute volume modes read volume_um3 and leave volume_pct to be derived later.
	const volumePctOptional = profile.volumeMode !== 'percent';
	const volumeUm3Optional = !volumePctOptional;
	const constantLine = profile.constants?.line as string;
	const constantProduct = profile.constants?.product as string;
	const constantPanel = profile.constants?.panelIndex ?? 0;
	const {
		serial: iSerial,
		time: iTime,
		line: iLine,
		product: iProduct,
		panel: iPanel,
		refdes: iRefdes,
		pad: iPad,
		volumePct: iVolume,
		areaPct: iArea,
		heightUm: iHeight,
		offsetXUm: iOffsetX,
		offsetYUm: iOffsetY,
		result: iResult,
		volumeUm3: iVolumeUm3,
		stencil: iStencil,
		printRun: iPrintRun
	} = columns;

	const resultByWord = new Map<string, ResultCode>();
	for (const kind of ['pass', 'warn', 'fail'] as const) {
		for (const word of profile.resultWords[kind]) {
			resultByWord.set(word.trim().toLowerCase(), RESULT_CODES[kind]);
		}
	}
	const resultWordList = [...resultByWord.keys()].join(', ');
	// Each word in lower, upper and capitalised case, compared in place before any slicing.
	const resultExact: [string, ResultCode][] = [];
	for (const [word, code] of resultByWord) {
		if (word === '') continue;
		for (const form of new Set([word, word.toUpperCase(), word[0].toUpperCase() + word.slice(1)])) {
			resultExact.push([form, code]);
		}
	}

	// The current record: cells are [starts[i], ends[i]) of rec.
	let rec = '';
	let starts: Int32Array = new Int32Array(0);
	let ends: Int32Array = new Int32Array(0);
	let rowHasError = false;

	// Values of the previous valid row, reused when a cell repeats them (most cells do).
	let lastSerial = '';
	let lastTimeText = '\u0000'; // never a cell (NUL is refused), so the first row is parsed
	let lastInspectedAtMs = NaN;
	let lastLine = '';
	let lastProduct = '';
	let lastRefdes = '';
	let lastStencil = '';
	let lastPrintRun = '';

	function bad(row: number, index: number, message: string): void {
		rowHasError = true;
		errors.add({
			row,
			column: index >= 0 ? names[index] : null,
			// Kept messages must not pin the chunk their quoted cell came from.
			message: errors.count < issueLimit ? detach(message) : message
		});
	}

	function cell(index: number): string {
		return rec.slice(starts[index], ends[index]);
	}

	/** Whether cell `index` is exactly `known` (then `known` is reused instead of a new slice). */
	function cellIs(index: number, known: string): boolean {
		const start = starts[index];
		return ends[index] - start === known.length && rec.startsWith(known, start);
	}

	function text(
		row: number,
		index: number,
		field: CanonicalField,
		required: boolean,
		previous: string
	): string {
		if (previous !== '' && cellIs(index, previous)) return previous;
		const value = cell(index).trim();
		if (value.length > MAX_TEXT_LENGTH) {
			bad(row, index, `${field} is longer than ${MAX_TEXT_LENGTH} characters`);
		} else if (required && value === '') {
			bad(row, index, `${field} is empty`);
		}
		return value;
	}

	function measure(
		row: number,
		index: number,
		field: keyof typeof FIELD_RANGES,
		factor: number,
		unit: string,
		optional: boolean,
		min: number,
		max: number
	): number {
		const value = parseDecimal(rec, decimalComma, starts[index], ends[index]);
		if (value !== value) {
			const raw = trimSpaces(cell(index));
			if (optional && raw === '') return NaN;
			bad(row, index, `${field} is not a number: ${quoteCell(raw)}`);
			return NaN;
		}
		const scaled = factor === 1 ? value : value * factor;
		// Bounds come in as plain numbers: a keyed lookup here would run six times per row.
		if (scaled < min || scaled > max) {
			bad(row, index, `${field} ${scaled} is outside ${rangeText(field, unit)}`);
		}
		return scaled;
	}

	function readResult(row: number): ResultCode {
		for (let k = 0; k < resultExact.length; k++) {
			if (cellIs(iResult, resultExact[k][0])) return resultExact[k][1];
		}
		const raw = cell(iResult).trim();
		const code = resultByWord.get(raw.toLowerCase());
		if (code !== undefined) return code;
		bad(row, iResult, `unknown result ${quoteCell(raw)} (expected one of: ${resultWordList})`);
		return 0;
	}

	function readTime(row: number): number {
		if (cellIs(iTime, lastTimeText)) return lastInspectedAtMs;
		const timeText = cell(iTime);
		const inspectedAtMs = parseTime(timeText);
		if (inspectedAtMs !== inspectedAtMs) {
			bad(
				row,
				iTime,
				`inspected_at is not a timestamp in format ${profile.timestampFormat}: ${quoteCell(trimSpaces(timeText))}`
			);
			return lastInspectedAtMs;
		}
		lastTimeText = timeText;
		lastInspectedAtMs = inspectedAtMs;
		return inspectedAtMs;
	}

	function readPanel(row: number): number {
		if (iPanel < 0) return constantPanel;
		const panelIndex = readIndex(rec, starts[iPanel], ends[iPanel]);
		if (!(panelIndex <= PANEL_MAX)) {
			bad(
				row,
				iPanel,
				`panel_index must be an integer ${rangeText('panel_index', '')}: ${quoteCell(trimSpaces(cell(iPanel)))}`
			);
		}
		return panelIndex;
	}

	return {
		bad,
		check(cells, row, out) {
			rec = cells.text;
			starts = cells.starts;
			ends = cells.ends;
			rowHasError = false;
			out.line = row;
			out.boardSerial =
				iSerial >= 0
					? text(row, iSerial, 'board_serial', true, lastSerial)
					: (serialFromName as string);
			out.inspectedAtMs = readTime(row);
			out.lineCode = iLine >= 0 ? text(row, iLine, 'line', true, lastLine) : constantLine;
			out.productCode =
				iProduct >= 0 ? text(row, iProduct, 'product', true, lastProduct) : constantProduct;
			out.panelIndex = readPanel(row);
			out.refdes = text(row, iRefdes, 'refdes', true, lastRefdes);
			out.pad =
				ends[iPad] - starts[iPad] === 1 && rec.charCodeAt(starts[iPad]) > 32
					? cell(iPad) // one visible character: V8 hands out a cached string, no allocation
					: text(row, iPad, 'pad', false, '');
			out.volumePct =
				iVolume >= 0
					? measure(
							row,
							iVolume,
							'volume_pct',
							1,
							UNIT.volume_pct,
							volumePctOptional,
							VOLUME_MIN,
							VOLUME_MAX
						)
					: NaN;
			out.areaPct = measure(row, iArea, 'area_pct', 1, UNIT.area_pct, false, AREA_MIN, AREA_MAX);
			out.heightUm = measure(
				row,
				iHeight,
				'height_um',
				lengthFactor,
				UNIT.height_um,
				false,
				HEIGHT_MIN,
				HEIGHT_MAX
			);
			out.offsetXUm = measure(
				row,
				iOffsetX,
				'offset_x_um',
				lengthFactor,
				UNIT.offset_x_um,
				false,
				OFFSET_MIN,
				OFFSET_MAX
			);
			out.offsetYUm = measure(
				row,
				iOffsetY,
				'offset_y_um',
				lengthFactor,
				UNIT.offset_y_um,
				false,
				OFFSET_MIN,
				OFFSET_MAX
			);
			out.volumeUm3 =
				iVolumeUm3 >= 0
					? measure(
							row,
							iVolumeUm3,
							'volume_um3',
							volumeFactor,
							' µm³',
							volumeUm3Optional,
							0,
							VOLUME_UM3_MAX
						)
					: NaN;
			out.result = readResult(row);
			out.stencil = iStencil >= 0 ? text(row, iStencil, 'stencil', false, lastStencil) : '';
			out.printRun = iPrintRun >= 0 ? text(row, iPrintRun, 'print_run', false, lastPrintRun) : '';
			if (rowHasError) return false;
			lastSerial = out.boardSerial;
			lastLine = out.lineCode;
			lastProduct = out.productCode;
			lastRefdes = out.refdes;
			lastStencil = out.stencil;
			lastPrintRun = out.printRun;
			return true;
		}
	};
}
