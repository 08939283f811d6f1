import { toCubicMicrometres, toMicrometres } from '../units';
import {
	createBoardAccumulator,
	type BoardAccumulator,
	type BoardAggregate
} from './board-accumulator';
import { FIELD_RANGES, MAX_TEXT_LENGTH, type CanonicalField } from './canonical-fields';
import { detectDelimiter, type Delimiter } from './detect-delimiter';
import { createIssueCollector, DEFAULT_ISSUE_LIMIT, type IngestIssue } from './ingest-issue';
import type { MappingProfile } from './mapping-profile';
import { parseDecimal, parseDecimalBytes } from './parse-decimal';
import {
	DEFAULT_SPI_PARSE_LIMITS,
	formatByteLimit,
	SPI_PARSE_LIMIT_ENV,
	type SpiParseLimits
} from './parse-limits';
import { createTimestampParser } from './parse-timestamp';
import { isValidTimeZone } from './zoned-time-to-utc';
import { resolveHeader, type ResolvedHeader } from './resolve-header';
import { compileSerialPattern, serialFromText } from './serial-pattern';
import { scanFieldBounds, splitQuotedLine } from './split-delimited-line';
import {
	boardInspectionKey,
	createSpiRowBatch,
	trimSpiRowBatch,
	type BoardHeader,
	type SpiRowBatch
} from './spi-row-batch';

/** Options of `createSpiRowParser`. */
export interface SpiRowParserOptions {
	profile: MappingProfile;
	/** Name of the uploaded/watched file (base name used for `serialFromFileName`). */
	fileName: string;
	/** Rows per emitted batch (default 8192). */
	batchSize?: number;
	/** Kept errors and warnings, each (default 100); all are counted. */
	issueLimit?: number;
	/** Budgets of the file (line length, columns, boards); `DEFAULT_SPI_PARSE_LIMITS` where absent. */
	limits?: Partial<SpiParseLimits>;
}

/** A board inspection with its figures over the accepted rows. */
export interface BoardInspection extends BoardHeader {
	aggregate: BoardAggregate;
}

/** Outcome of a whole file. */
export interface SpiParseSummary {
	/** True when the file may be committed: no file-level error, ≥ 1 accepted row, and either
	 * no row errors or the profile skips bad rows. */
	ok: boolean;
	fileName: string;
	/** Delimiter used (detected or from the profile); null when no header was read. */
	delimiter: Delimiter | null;
	/** Header as written (trimmed). */
	header: string[];
	/** Non-blank lines after the header (records). */
	dataRows: number;
	/** Rows that passed every check (imported only when `ok`). */
	rowsAccepted: number;
	/** Rows with at least one error. `rowsAccepted + rowsRejected = dataRows` unless a
	 * file-level error stopped reading. */
	rowsRejected: number;
	/** Total errors found; `errors` keeps the first `issueLimit`. */
	errorCount: number;
	errors: IngestIssue[];
	warningCount: number;
	warnings: IngestIssue[];
	/** Boards with aggregates, in order of first appearance (empty when the file is rejected). */
	boards: BoardInspection[];
}

/** A push-driven parser for one file. */
export interface SpiRowParser {
	/** Feed the next piece of the file (bytes or text); returns the batches completed by it. */
	push(chunk: Uint8Array | string): SpiRowBatch[];
	/** Signal end of file; returns the last batches. Further pushes are ignored. */
	end(): SpiRowBatch[];
	/** Boards seen so far (append-only list; index = `BoardHeader.index`). */
	boards(): readonly BoardHeader[];
	/** Counts, issues and boards; final after `end()`. */
	summary(): SpiParseSummary;
}

const DEFAULT_BATCH_SIZE = 8192;
// A quoted field may span lines; past this the quote is surely unterminated.
const MAX_RECORD_LINES = 50;
const MAX_RECORD_CHARS = 65536;

const TEXT_CACHE_SIZE = 16384;

/** The 128 one-character ASCII strings, so a one-byte cell costs no allocation. */
const ASCII_CHARS = Array.from({ length: 128 }, (_, code) => String.fromCharCode(code));

/** ASCII bytes `[start, end)` as a string (the byte path has checked they are all < 0x80). */
function asciiText(bytes: Uint8Array, start: number, end: number): string {
	if (end - start === 1) return ASCII_CHARS[bytes[start]];
	return String.fromCharCode.apply(null, bytes.subarray(start, end) as unknown as number[]);
}

/**
 * Field bounds of one plain line `bytes[start, end)`: field i is `[starts[i], ends[i])`. Returns
 * the field count, or -1 when the line has a quote or a non-ASCII byte, or more fields than
 * `starts` holds (the text path then reads it).
 */
function scanByteFields(
	bytes: Uint8Array,
	start: number,
	end: number,
	delimiter: number,
	starts: Int32Array,
	ends: Int32Array
): number {
	const capacity = starts.length;
	let count = 0;
	let fieldStart = start;
	for (let i = start; i < end; i++) {
		const c = bytes[i];
		if (c === delimiter) {
			if (count + 1 >= capacity) return -1;
			starts[count] = fieldStart;
			ends[count] = i;
			count++;
			fieldStart = i + 1;
		} else if (c === 34 || c >= 128) {
			return -1;
		}
	}
	starts[count] = fieldStart;
	ends[count] = end;
	return count + 1;
}

/** Whether ASCII bytes `[start, start + text.length)` spell `text`. */
function bytesSpell(bytes: Uint8Array, start: number, text: string): boolean {
	for (let k = 0; k < text.length; k++) if (bytes[start + k] !== text.charCodeAt(k)) return false;
	return true;
}

const RESULT_CODES = { pass: 0, warn: 1, fail: 2 } as const;
const VOLUME_MIN = FIELD_RANGES.volume_pct.min;
const VOLUME_MAX = FIELD_RANGES.volume_pct.max;
const AREA_MIN = FIELD_RANGES.area_pct.min;
const AREA_MAX = FIELD_RANGES.area_pct.max;
const HEIGHT_MIN = FIELD_RANGES.height_um.min;
const HEIGHT_MAX = FIELD_RANGES.height_um.max;
const OFFSET_MIN = FIELD_RANGES.offset_x_um.min;
const OFFSET_MAX = FIELD_RANGES.offset_x_um.max;

/**
 * A copy of `s` that does not share memory with the string it was cut from. V8 represents
 * `slice` results of 13+ characters as views on the parent (here a 64 KiB chunk), so a board
 * serial kept to the end would pin its whole chunk and memory would grow with file size.
 * Concatenating then slicing forces a fresh flat string.
 */
function detach(s: string): string {
	return s.length < 13 ? s : (' ' + s).slice(1);
}

/**
 * Offset of the first byte that breaks UTF-8 (RFC 3629 §4 syntax: no overlongs, no surrogates,
 * ≤ U+10FFFF), or -1 when the bytes are valid up to a possibly cut-off final sequence.
 */
function firstInvalidUtf8Byte(bytes: Uint8Array): number {
	let i = 0;
	while (i < bytes.length) {
		const b = bytes[i];
		let need: number;
		let lo = 0x80;
		let hi = 0xbf;
		if (b < 0x80) {
			i++;
			continue;
		} else if (b >= 0xc2 && b <= 0xdf) need = 1;
		else if (b >= 0xe0 && b <= 0xef) {
			need = 2;
			if (b === 0xe0) lo = 0xa0;
			if (b === 0xed) hi = 0x9f;
		} else if (b >= 0xf0 && b <= 0xf4) {
			need = 3;
			if (b === 0xf0) lo = 0x90;
			if (b === 0xf4) hi = 0x8f;
		} else return i;
		for (let k = 1; k <= need; k++) {
			if (i + k >= bytes.length) return -1;
			const c = bytes[i + k];
			if (c < (k === 1 ? lo : 0x80) || c > (k === 1 ? hi : 0xbf)) return i;
		}
		i += need + 1;
	}
	return -1;
}

/** Non-negative integer of 1–5 plain digits in text[start, end), spaces around allowed; else NaN. */
function readIndex(text: string, start: number, end: number): number {
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

/** `s` without the ASCII spaces around it (the only padding numbers and timestamps may have). */
function trimSpaces(s: string): string {
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
 */
function quoteCell(raw: string): string {
	const shown = raw.length > 60 ? raw.slice(0, 60) + '…' : raw;
	const spelled = shown.replace(
		INVISIBLE,
		(c) => '\\u' + c.charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')
	);
	return `"${spelled}"`;
}

function baseName(fileName: string): string {
	const cut = Math.max(fileName.lastIndexOf('/'), fileName.lastIndexOf('\\'));
	return fileName.slice(cut + 1);
}

function rangeText(field: keyof typeof FIELD_RANGES, unit: string): string {
	const r = FIELD_RANGES[field];
	return `${r.min} to ${r.max}${unit}`;
}

/**
 * Create a streaming parser for one SPI export. Feed it chunks (`Uint8Array` bytes, decoded as
 * strict UTF-8, or strings) in file order; it keeps only the unfinished line between chunks, so
 * memory does not grow with file size (apart from one small record per board inspection).
 *
 * Per line: BOM and CR are dropped, blank lines skipped, lines without `"` split by `indexOf`
 * (fast path) and lines with quotes by an RFC 4180 reader (a quoted field may span lines).
 * The header is matched through the profile (`resolveHeader`); each row is checked for field
 * count, numbers (`FIELD_RANGES`, after unit conversion to µm / µm³), timestamp, result word,
 * non-empty serial / refdes / line / product, panel index as integer 0–65535, text ≤ 100 chars,
 * and that line / product / stencil / print run agree within a board inspection (serial +
 * time). Errors are `{ row, column, message }`, row = file line (header = 1; row 0 = the file
 * as a whole: empty, not UTF-8 text, NUL bytes, file name, no data rows).
 *
 * Policies: `skip-row` imports the good rows; `reject-file` stops emitting batches at the first
 * bad row but keeps validating to report errors. Whenever `summary().ok` is false after `end()`
 * (bad row under `reject-file`, or a file-level error found late, e.g. invalid bytes near the
 * end), the caller must roll back what it wrote from earlier batches (one transaction per file).
 *
 * @throws Error when the profile's timestamp pattern or time zone is invalid (validate profiles
 *   with `mappingProfileSchema` first), or `batchSize` is not a positive integer. Never throws on
 *   file content: that becomes errors in `summary()`, and so does a serial pattern RE2 refuses
 *   (a profile saved before patterns ran on RE2).
 * @example
 * const parser = createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'a.csv' });
 * for await (const chunk of stream) for (const batch of parser.push(chunk)) write(batch);
 * for (const batch of parser.end()) write(batch);
 * parser.summary().ok // true
 */
export function createSpiRowParser(options: SpiRowParserOptions): SpiRowParser {
	const { profile, fileName } = options;
	const batchSize = options.batchSize ?? DEFAULT_BATCH_SIZE;
	if (!Number.isInteger(batchSize) || batchSize < 1) {
		throw new RangeError(
			`createSpiRowParser requires a positive integer batchSize, got ${batchSize}`
		);
	}
	// Fail at creation, not on the first row without an offset.
	if (!isValidTimeZone(profile.timeZone)) {
		throw new RangeError(`createSpiRowParser: unknown time zone "${profile.timeZone}"`);
	}
	const parseTime = createTimestampParser(profile.timestampFormat, profile.timeZone);
	const issueLimit = options.issueLimit ?? DEFAULT_ISSUE_LIMIT;
	// Budgets, counted before the work they bound (see parse-limits.ts).
	const maxLineBytes = options.limits?.maxLineBytes ?? DEFAULT_SPI_PARSE_LIMITS.maxLineBytes;
	const maxColumns = options.limits?.maxColumns ?? DEFAULT_SPI_PARSE_LIMITS.maxColumns;
	const maxBoards = options.limits?.maxBoards ?? DEFAULT_SPI_PARSE_LIMITS.maxBoards;
	for (const [name, value] of [
		['maxLineBytes', maxLineBytes],
		['maxColumns', maxColumns],
		['maxBoards', maxBoards]
	] as const) {
		if (!Number.isSafeInteger(value) || value < 1) {
			throw new RangeError(`createSpiRowParser requires a positive integer ${name}, got ${value}`);
		}
	}
	const errors = createIssueCollector(issueLimit);
	const warnings = createIssueCollector(issueLimit);
	const skipRows = profile.onBadRow === 'skip-row';
	const decimalComma = profile.decimalComma;
	const lengthFactor = toMicrometres(1, profile.lengthUnit);
	const volumeFactor = profile.volumeMode === 'absolute-mil3' ? toCubicMicrometres(1, 'mil') : 1;
	// Absolute volume modes read volume_um3 and leave volume_pct to be derived later.
	const volumePctOptional = profile.volumeMode !== 'percent';
	const volumeUm3Optional = !volumePctOptional;

	const resultByWord = new Map<string, 0 | 1 | 2>();
	for (const kind of ['pass', 'warn', 'fail'] as const) {
		for (const word of profile.resultWords[kind]) {
			resultByWord.set(word.trim().toLowerCase(), RESULT_CODES[kind]);
		}
	}
	const resultWordList = [...resultByWord.keys()].join(', ');
	// Each word in lower, upper and capitalised case, compared in place before any slicing.
	const resultExact: [string, number][] = [];
	for (const [word, code] of resultByWord) {
		if (word === '') continue;
		for (const form of new Set([word, word.toUpperCase(), word[0].toUpperCase() + word.slice(1)])) {
			resultExact.push([form, code]);
		}
	}

	// State
	let fileFailed = false; // file-level error: nothing more is read
	let rejected = false; // reject-file policy hit: validate only
	let ended = false;
	const utf8 = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
	let bytesSeen = 0;
	// Byte input: the unfinished last line, and the file offset of the next line's first byte.
	let byteCarry: Uint8Array | null = null;
	let lineOffset = 0;
	let firstLine = true;
	// Field bounds of the byte path, and the delimiter as a byte (-1: the byte path is off).
	let byteStarts = new Int32Array(0);
	let byteEnds = new Int32Array(0);
	let delimiterByte = -1;
	// Strings of recent text cells by a hash of their bytes (bounded: one per slot).
	const textCache = new Array<string | undefined>(TEXT_CACHE_SIZE);
	let firstText = true;
	let carry = '';
	let lineNo = 0;
	let pending = ''; // multi-line quoted record being assembled
	let pendingStart = 0;
	let pendingLines = 0;
	let sawNonBlank = false;
	let header: ResolvedHeader | null = null;
	let headerCount = 0;
	let delimiter: Delimiter | null = profile.delimiter === 'auto' ? null : profile.delimiter;
	let dataRows = 0;
	let rowsAccepted = 0;
	let rowsRejected = 0;
	let serialFromName: string | null = null;
	let out: SpiRowBatch[] = [];
	let batch = createSpiRowBatch(batchSize);
	const boardList: BoardHeader[] = [];
	const boardAccumulators: BoardAccumulator[] = [];
	const boardByKey = new Map<string, number>();
	// Cell boundaries of the current record; sized from the header (+1 to see extra fields).
	let starts = new Int32Array(0);
	let ends = new Int32Array(0);

	// Column indices, set from the header.
	let iSerial = -1;
	let iTime = -1;
	let iLine = -1;
	let iProduct = -1;
	let iPanel = -1;
	let iRefdes = -1;
	let iPad = -1;
	let iVolume = -1;
	let iArea = -1;
	let iHeight = -1;
	let iOffsetX = -1;
	let iOffsetY = -1;
	let iResult = -1;
	let iVolumeUm3 = -1;
	let iStencil = -1;
	let iPrintRun = -1;

	function fileError(message: string): void {
		errors.add({ row: 0, column: null, message });
		fileFailed = true;
	}

	if (profile.serialFromFileName) {
		const name = baseName(fileName);
		const pattern = profile.serialFromFileName.pattern;
		// RE2: linear-time matching whatever the user typed (see serial-pattern.ts).
		const compiled = compileSerialPattern(pattern);
		const serial = compiled.ok ? serialFromText(compiled.regex, name) : null;
		if (!compiled.ok) {
			fileError(`the profile's ${compiled.reason}; edit the mapping profile`);
		} else if (serial === null) {
			fileError(`file name "${name}" does not match the serial pattern /${pattern}/`);
		} else if (serial.length > MAX_TEXT_LENGTH) {
			fileError(`board_serial from the file name is longer than ${MAX_TEXT_LENGTH} characters`);
		} else {
			serialFromName = serial;
		}
	}

	function flushBatch(): void {
		if (batch.length > 0 || batch.newBoards.length > 0) {
			out.push(trimSpiRowBatch(batch));
			batch = createSpiRowBatch(batchSize);
		}
	}

	function readHeader(record: string, sample: string): void {
		if (delimiter === null) delimiter = detectDelimiter(sample);
		// Count the columns before splitting (a delimiter inside quotes only over-counts).
		let columns = 1;
		for (let at = record.indexOf(delimiter); at >= 0; at = record.indexOf(delimiter, at + 1)) {
			columns++;
		}
		if (columns > maxColumns && record.indexOf('"') < 0) return tooManyColumns(columns);
		const split =
			record.indexOf('"') < 0 ? record.split(delimiter) : splitQuotedLine(record, delimiter).fields;
		if (!split) {
			errors.add({ row: lineNo, column: null, message: 'header line has an unterminated quote' });
			fileFailed = true;
			return;
		}
		if (split.length > maxColumns) return tooManyColumns(split.length);
		header = resolveHeader(split, profile);
		headerCount = split.length;
		starts = new Int32Array(headerCount + 1);
		ends = new Int32Array(headerCount + 1);
		byteStarts = new Int32Array(headerCount);
		byteEnds = new Int32Array(headerCount);
		const code = delimiter.length === 1 ? delimiter.charCodeAt(0) : -1;
		// Quotes, line breaks and non-ASCII delimiters are left to the text path.
		delimiterByte = code > 0 && code < 128 && code !== 34 && code !== 10 && code !== 13 ? code : -1;
		for (const w of header.warnings) warnings.add(w);
		if (header.errors.length > 0) {
			for (const e of header.errors) errors.add(e);
			fileFailed = true;
			return;
		}
		const ix = header.indices;
		iSerial = serialFromName === null ? ix.board_serial : -1;
		iTime = ix.inspected_at;
		iLine = profile.constants?.line === undefined ? ix.line : -1;
		iProduct = profile.constants?.product === undefined ? ix.product : -1;
		iPanel = profile.constants?.panelIndex === undefined ? ix.panel_index : -1;
		iRefdes = ix.refdes;
		iPad = ix.pad;
		iVolume = ix.volume_pct;
		iArea = ix.area_pct;
		iHeight = ix.height_um;
		iOffsetX = ix.offset_x_um;
		iOffsetY = ix.offset_y_um;
		iResult = ix.result;
		iVolumeUm3 = ix.volume_um3;
		iStencil = ix.stencil;
		iPrintRun = ix.print_run;
	}

	function tooManyColumns(columns: number): void {
		errors.add({
			row: lineNo,
			column: null,
			message: `header has ${columns} columns, more than the limit of ${maxColumns} (${SPI_PARSE_LIMIT_ENV.maxColumns})`
		});
		fileFailed = true;
	}

	// Set by `bad` while one row is checked, so all its errors are reported, not just the first.
	let rowHasError = false;
	function bad(row: number, index: number, message: string): void {
		rowHasError = true;
		errors.add({
			row,
			column: index >= 0 ? (header as ResolvedHeader).names[index] : null,
			// Kept messages must not pin the chunk their quoted cell came from.
			message: errors.count < issueLimit ? detach(message) : message
		});
	}

	// The current record and its cell boundaries. Cells are read in place (no substring per
	// cell): that keeps the garbage collector out of the hot loop.
	let rec = '';
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

	function readResult(row: number): number {
		for (let k = 0; k < resultExact.length; k++) {
			if (cellIs(iResult, resultExact[k][0])) return resultExact[k][1];
		}
		const raw = cell(iResult).trim();
		const code = resultByWord.get(raw.toLowerCase());
		if (code !== undefined) return code;
		bad(row, iResult, `unknown result ${quoteCell(raw)} (expected one of: ${resultWordList})`);
		return -1;
	}

	// Values of the previous accepted row, reused when a cell repeats them (most cells do).
	let lastSerial = '';
	let lastTimeText = '\u0000'; // never a cell (NUL is refused), so the first row is parsed
	let lastInspectedAtMs = NaN;
	let lastBoardSerial = '';
	let lastBoardMs = NaN;
	let lastBoardIndex = -1;
	let lastLine = '';
	let lastProduct = '';
	let lastRefdes = '';
	let lastStencil = '';
	let lastPrintRun = '';

	// Error path only (building the message costs a Date and several strings).
	function reportBoardConflict(
		row: number,
		b: BoardHeader,
		lineCode: string,
		productCode: string,
		stencil: string,
		printRun: string
	): void {
		const of = `than earlier rows of board ${b.boardSerial} inspected ${new Date(b.inspectedAtMs).toISOString()}`;
		if (b.lineCode !== lineCode)
			bad(row, iLine, `line "${lineCode}" differs from "${b.lineCode}" ${of}`);
		if (b.productCode !== productCode) {
			bad(row, iProduct, `product "${productCode}" differs from "${b.productCode}" ${of}`);
		}
		if ((b.stencil ?? '') !== stencil) {
			bad(row, iStencil, `stencil "${stencil}" differs from "${b.stencil ?? ''}" ${of}`);
		}
		if ((b.printRun ?? '') !== printRun) {
			bad(row, iPrintRun, `print_run "${printRun}" differs from "${b.printRun ?? ''}" ${of}`);
		}
	}

	/**
	 * Check one record and add it to the batch. Unquoted records are read in place from
	 * `source[from, to)` (usually the whole decoded chunk); quoted ones come as their own string.
	 */
	function readRecord(
		source: string,
		from: number,
		to: number,
		row: number,
		quoted: boolean
	): void {
		dataRows++;
		let n: number;
		if (!quoted) {
			rec = source;
			n = scanFieldBounds(source, delimiter as string, starts, ends, from, to);
		} else {
			const split = splitQuotedLine(source.slice(from, to), delimiter as string);
			if (!split.fields) {
				errors.add({ row, column: null, message: split.error });
				rejectRow();
				return;
			}
			// Rare path: rejoin the unquoted cells with NUL (never in a valid file) so the
			// in-place readers below work unchanged.
			rec = split.fields.join('\u0000');
			n = scanFieldBounds(rec, '\u0000', starts, ends);
		}
		if (n !== headerCount) {
			errors.add({
				row,
				column: null,
				message:
					n < headerCount
						? `row has ${n} fields, header has ${headerCount} (cut-off line?)`
						: `row has ${n} fields, header has ${headerCount}`
			});
			rejectRow();
			return;
		}
		rowHasError = false;
		const serial =
			iSerial >= 0
				? text(row, iSerial, 'board_serial', true, lastSerial)
				: (serialFromName as string);
		let inspectedAtMs = lastInspectedAtMs;
		if (!cellIs(iTime, lastTimeText)) {
			const timeText = cell(iTime);
			inspectedAtMs = parseTime(timeText);
			if (inspectedAtMs !== inspectedAtMs) {
				bad(
					row,
					iTime,
					`inspected_at is not a timestamp in format ${profile.timestampFormat}: ${quoteCell(trimSpaces(timeText))}`
				);
			} else {
				lastTimeText = timeText;
				lastInspectedAtMs = inspectedAtMs;
			}
		}
		const lineCode =
			iLine >= 0 ? text(row, iLine, 'line', true, lastLine) : (profile.constants?.line as string);
		const productCode =
			iProduct >= 0
				? text(row, iProduct, 'product', true, lastProduct)
				: (profile.constants?.product as string);
		let panelIndex = profile.constants?.panelIndex ?? 0;
		if (iPanel >= 0) {
			panelIndex = readIndex(rec, starts[iPanel], ends[iPanel]);
			if (!(panelIndex <= FIELD_RANGES.panel_index.max)) {
				bad(
					row,
					iPanel,
					`panel_index must be an integer ${rangeText('panel_index', '')}: ${quoteCell(trimSpaces(cell(iPanel)))}`
				);
			}
		}
		const refdes = text(row, iRefdes, 'refdes', true, lastRefdes);
		const pad =
			ends[iPad] - starts[iPad] === 1 && rec.charCodeAt(starts[iPad]) > 32
				? cell(iPad) // one visible character: V8 hands out a cached string, no allocation
				: text(row, iPad, 'pad', false, '');
		const volumePct =
			iVolume >= 0
				? measure(row, iVolume, 'volume_pct', 1, ' %', volumePctOptional, VOLUME_MIN, VOLUME_MAX)
				: NaN;
		const areaPct = measure(row, iArea, 'area_pct', 1, ' %', false, AREA_MIN, AREA_MAX);
		const heightUm = measure(
			row,
			iHeight,
			'height_um',
			lengthFactor,
			' µm',
			false,
			HEIGHT_MIN,
			HEIGHT_MAX
		);
		const offsetXUm = measure(
			row,
			iOffsetX,
			'offset_x_um',
			lengthFactor,
			' µm',
			false,
			OFFSET_MIN,
			OFFSET_MAX
		);
		const offsetYUm = measure(
			row,
			iOffsetY,
			'offset_y_um',
			lengthFactor,
			' µm',
			false,
			OFFSET_MIN,
			OFFSET_MAX
		);
		const volumeUm3 =
			iVolumeUm3 >= 0
				? measure(
						row,
						iVolumeUm3,
						'volume_um3',
						volumeFactor,
						' µm³',
						volumeUm3Optional,
						0,
						FIELD_RANGES.volume_um3.max
					)
				: NaN;
		const result = readResult(row);
		const stencil = iStencil >= 0 ? text(row, iStencil, 'stencil', false, lastStencil) : '';
		const printRun = iPrintRun >= 0 ? text(row, iPrintRun, 'print_run', false, lastPrintRun) : '';
		if (rowHasError) {
			rejectRow();
			return;
		}
		acceptRow(
			row,
			serial,
			inspectedAtMs,
			lineCode,
			productCode,
			panelIndex,
			refdes,
			pad,
			volumePct,
			areaPct,
			heightUm,
			offsetXUm,
			offsetYUm,
			volumeUm3,
			result,
			stencil,
			printRun
		);
	}

	/**
	 * Group a row that passed its cell checks into its board inspection and add it to the batch
	 * (both the text and the byte path end here).
	 */
	function acceptRow(
		row: number,
		serial: string,
		inspectedAtMs: number,
		lineCode: string,
		productCode: string,
		panelIndex: number,
		refdes: string,
		pad: string,
		volumePct: number,
		areaPct: number,
		heightUm: number,
		offsetXUm: number,
		offsetYUm: number,
		volumeUm3: number,
		result: number,
		stencil: string,
		printRun: string
	): void {
		lastLine = lineCode;
		lastProduct = productCode;
		lastRefdes = refdes;
		lastStencil = stencil;
		lastPrintRun = printRun;

		// Group into board inspections; board-level fields must agree within one. Rows of a board
		// are usually contiguous, so the last board is checked before building a map key.
		let boardIndex: number | undefined;
		if (serial === lastBoardSerial && inspectedAtMs === lastBoardMs) {
			boardIndex = lastBoardIndex;
		} else {
			boardIndex = boardByKey.get(boardInspectionKey(serial, inspectedAtMs));
		}
		if (boardIndex !== undefined) {
			const b = boardList[boardIndex];
			if (
				b.lineCode !== lineCode ||
				b.productCode !== productCode ||
				(b.stencil ?? '') !== stencil ||
				(b.printRun ?? '') !== printRun
			) {
				reportBoardConflict(row, b, lineCode, productCode, stencil, printRun);
			}
			if (rowHasError) {
				rejectRow();
				return;
			}
		}
		if (boardIndex === undefined && !rejected && boardList.length >= maxBoards) {
			// Every board is held until the end of the file: stop before memory runs out.
			errors.add({
				row,
				column: iSerial >= 0 ? (header as ResolvedHeader).names[iSerial] : null,
				message: `board inspection ${serial} is one more than the limit of ${maxBoards} per file (${SPI_PARSE_LIMIT_ENV.maxBoards}); split the export`
			});
			fileFailed = true;
			rowsRejected++;
			return;
		}
		rowsAccepted++;
		if (rejected) return;
		if (boardIndex === undefined) {
			boardIndex = boardList.length;
			// Board fields live until the end of the file: copy them off the chunk they were cut from.
			const board: BoardHeader = {
				index: boardIndex,
				boardSerial: detach(serial),
				inspectedAtMs,
				lineCode: detach(lineCode),
				productCode: detach(productCode),
				stencil: stencil === '' ? null : detach(stencil),
				printRun: printRun === '' ? null : detach(printRun),
				firstLine: row
			};
			boardList.push(board);
			boardAccumulators.push(createBoardAccumulator());
			boardByKey.set(boardInspectionKey(board.boardSerial, inspectedAtMs), boardIndex);
			batch.newBoards.push(board);
		}
		lastSerial = serial;
		lastBoardSerial = serial;
		lastBoardMs = inspectedAtMs;
		lastBoardIndex = boardIndex;
		boardAccumulators[boardIndex].addMeasures(
			volumePct,
			areaPct,
			heightUm,
			offsetXUm,
			offsetYUm,
			result as 0 | 1 | 2
		);
		const i = batch.length;
		batch.line[i] = row;
		batch.boardIndex[i] = boardIndex;
		batch.panelIndex[i] = panelIndex;
		batch.refdes[i] = refdes;
		batch.pad[i] = pad;
		batch.volumePct[i] = volumePct;
		batch.areaPct[i] = areaPct;
		batch.heightUm[i] = heightUm;
		batch.offsetXUm[i] = offsetXUm;
		batch.offsetYUm[i] = offsetYUm;
		batch.volumeUm3[i] = volumeUm3;
		batch.result[i] = result;
		batch.length = i + 1;
		if (batch.length === batchSize) flushBatch();
	}

	function rejectRow(): void {
		rowsRejected++;
		if (!skipRows && !rejected) {
			rejected = true;
			// Nothing more is handed out; the caller rolls back what it has.
			batch = createSpiRowBatch(1);
		}
	}

	// Position of the next '"' in the current text (-1: none left), so each line's quote test
	// does not rescan the rest of the chunk.
	let quoteAt = -1;
	let quoteFrom = Infinity;

	/** Handle one physical line, `data[start, end)` without its line break. */
	function handleLine(data: string, start: number, end: number): void {
		lineNo++;
		if (pending !== '') {
			pending += '\n' + data.slice(start, end);
			pendingLines++;
			tryRecord(pending, pendingStart, pending);
			return;
		}
		if (end === start) return;
		if (data.charCodeAt(start) <= 32 && data.slice(start, end).trim() === '') return;
		if (start < quoteFrom || (quoteAt >= 0 && quoteAt < start)) {
			quoteAt = data.indexOf('"', start);
			quoteFrom = start;
		}
		if (header !== null && (quoteAt < 0 || quoteAt >= end)) {
			readRecord(data, start, end, lineNo, false); // hot path: no quote, no slicing
			return;
		}
		tryRecord(
			data.slice(start, end),
			lineNo,
			header === null ? data.slice(start, start + 16384) : ''
		);
	}

	function tryRecord(record: string, row: number, sample: string): void {
		const quoted = record.indexOf('"') >= 0;
		if (quoted) {
			const d = delimiter ?? detectDelimiter(sample);
			const split = splitQuotedLine(record, d);
			if (
				split.unterminated &&
				pendingLines < MAX_RECORD_LINES &&
				record.length < MAX_RECORD_CHARS
			) {
				if (pending === '') {
					pendingStart = row;
					pendingLines = 1;
				}
				pending = record;
				return;
			}
		}
		pending = '';
		pendingLines = 0;
		if (header === null) {
			sawNonBlank = true;
			readHeader(record, sample);
		} else {
			readRecord(record, 0, record.length, row, quoted);
		}
	}

	function processText(textChunk: string, final: boolean): void {
		let data = carry + textChunk;
		if (firstText && data.length > 0) {
			firstText = false;
			if (data.charCodeAt(0) === 0xfeff) data = data.slice(1);
		}
		let start = 0;
		quoteAt = -1;
		quoteFrom = Infinity; // new text: quote position unknown
		for (;;) {
			if (fileFailed) return;
			const nl = data.indexOf('\n', start);
			if (nl < 0) break;
			if (nl - start > maxLineBytes) return lineTooLong();
			const end = nl > start && data.charCodeAt(nl - 1) === 13 ? nl - 1 : nl;
			handleLine(data, start, end);
			start = nl + 1;
		}
		// Text input counts UTF-16 units against the byte limit (at most 3 bytes each in UTF-8).
		if (data.length - start > maxLineBytes) return lineTooLong();
		carry = data.slice(start);
		if (final && !fileFailed) {
			if (carry.length > 0) {
				const last = carry.endsWith('\r') ? carry.slice(0, -1) : carry;
				carry = '';
				quoteAt = -1;
				quoteFrom = Infinity;
				handleLine(last, 0, last.length);
			}
			if (pending !== '' && !fileFailed) {
				errors.add({
					row: pendingStart,
					column: null,
					message: 'unterminated quoted field at end of file'
				});
				pending = '';
				if (header === null) fileFailed = true;
				else {
					dataRows++;
					rejectRow();
				}
			}
		}
	}

	/**
	 * Byte input: cut the chunk into lines and read each one. Only the unfinished last line is
	 * kept (copied: the caller may reuse its buffer); a line is never split, so a multi-byte
	 * character cannot fall across a chunk border.
	 */
	function pushBytes(chunk: Uint8Array): void {
		const nul = chunk.indexOf(0);
		if (nul >= 0) {
			let line = lineNo + 1;
			for (let i = 0; i < nul; i++) if (chunk[i] === 10) line++;
			fileError(
				`file is not text: NUL byte at byte ${bytesSeen + nul} (line ${line}); is it a binary export?`
			);
			return;
		}
		bytesSeen += chunk.length;
		let pos = 0;
		if (byteCarry !== null) {
			const nl = chunk.indexOf(10);
			const upTo = nl < 0 ? chunk.length : nl + 1;
			// Measured before the copy: a file without line feeds is refused, not buffered.
			if (byteCarry.length + (nl < 0 ? chunk.length : nl) > maxLineBytes) return lineTooLong();
			const joined = new Uint8Array(byteCarry.length + upTo);
			joined.set(byteCarry);
			joined.set(chunk.subarray(0, upTo), byteCarry.length);
			if (nl < 0) {
				byteCarry = joined;
				return;
			}
			byteCarry = null;
			lineFromBytes(joined, 0, joined.length - 1, false);
			pos = upTo;
		}
		for (;;) {
			if (fileFailed) return;
			const nl = chunk.indexOf(10, pos);
			if (nl < 0) break;
			if (nl - pos > maxLineBytes) return lineTooLong();
			lineFromBytes(chunk, pos, nl, false);
			pos = nl + 1;
		}
		if (pos < chunk.length) {
			if (chunk.length - pos > maxLineBytes) return lineTooLong();
			byteCarry = chunk.slice(pos);
		}
	}

	/** The next physical line (`lineNo + 1`) is over the line budget: the file is refused. */
	function lineTooLong(): void {
		const row = lineNo + 1;
		errors.add({
			row,
			column: null,
			message: `line ${row} is longer than the limit of ${formatByteLimit(maxLineBytes)} (${SPI_PARSE_LIMIT_ENV.maxLineBytes}); is this a text export with line breaks?`
		});
		fileFailed = true;
		byteCarry = null;
		carry = '';
	}

	/**
	 * One physical line of byte input, `bytes[from, to)` without its line feed (`final`: the
	 * file's last line, which has none). Plain ASCII rows take the byte path; everything else
	 * (the header, quotes, non-ASCII text, blank lines, any cell the byte path does not accept)
	 * is decoded as strict UTF-8 and read by the text path, which also words the errors.
	 */
	function lineFromBytes(bytes: Uint8Array, from: number, to: number, final: boolean): void {
		const offset = lineOffset;
		lineOffset += to - from + (final ? 0 : 1);
		let start = from;
		const end = to > from && bytes[to - 1] === 13 ? to - 1 : to;
		if (firstLine) {
			firstLine = false;
			firstText = false;
			if (
				end - start >= 3 &&
				bytes[start] === 0xef &&
				bytes[start + 1] === 0xbb &&
				bytes[start + 2] === 0xbf
			)
				start += 3;
		}
		if (header !== null && pending === '' && delimiterByte >= 0 && readRowBytes(bytes, start, end))
			return;
		let text: string;
		try {
			text = utf8.decode(bytes.subarray(start, end));
		} catch {
			// Error path only: find the offending byte (the line feed after the line counts, so a
			// sequence cut off by it is caught at its first byte).
			const bad = firstInvalidUtf8Byte(bytes.subarray(start, final ? to : to + 1));
			fileError(
				bad < 0
					? 'file is not valid UTF-8 text (it ends inside a multi-byte character)'
					: `file is not valid UTF-8 text (byte 0x${bytes[start + bad].toString(16).toUpperCase().padStart(2, '0')} at byte ${offset + (start - from) + bad}, line ${lineNo + 1}); save or export it as UTF-8`
			);
			return;
		}
		// A new string each line: the text path's quote position must be looked up afresh.
		quoteAt = -1;
		quoteFrom = Infinity;
		if (header === null && pending === '') {
			// The header line comes with up to 16 KiB of what follows, for delimiter detection.
			const sample = new TextDecoder().decode(
				bytes.subarray(Math.min(to + 1, bytes.length), Math.min(bytes.length, start + 16384))
			);
			handleLine(text + '\n' + sample, 0, text.length);
		} else {
			handleLine(text, 0, text.length);
		}
	}

	/**
	 * The byte path: read one plain row straight from ASCII bytes — no decoding, and strings only
	 * for cells that differ from the previous row's. Returns false, having changed nothing, for
	 * anything it does not handle (quotes, bytes ≥ 0x80, padding, a wrong field count, any value
	 * the text path would reject); the caller then reads the line as text.
	 */
	function readRowBytes(bytes: Uint8Array, start: number, end: number): boolean {
		if (end === start || bytes[start] <= 32) return false;
		if (scanByteFields(bytes, start, end, delimiterByte, byteStarts, byteEnds) !== headerCount)
			return false;
		const fieldStarts = byteStarts;
		const fieldEnds = byteEnds;

		const serial = iSerial >= 0 ? cellText(bytes, iSerial, lastSerial, true) : serialFromName;
		if (serial === null) return false;
		let inspectedAtMs = lastInspectedAtMs;
		const timeStart = fieldStarts[iTime];
		const timeEnd = fieldEnds[iTime];
		if (
			timeEnd - timeStart !== lastTimeText.length ||
			!bytesSpell(bytes, timeStart, lastTimeText)
		) {
			const timeText = asciiText(bytes, timeStart, timeEnd);
			inspectedAtMs = parseTime(timeText);
			if (inspectedAtMs !== inspectedAtMs) return false;
			lastTimeText = timeText;
			lastInspectedAtMs = inspectedAtMs;
		}
		const lineCode =
			iLine >= 0 ? cellText(bytes, iLine, lastLine, true) : (profile.constants?.line as string);
		if (lineCode === null) return false;
		const productCode =
			iProduct >= 0
				? cellText(bytes, iProduct, lastProduct, true)
				: (profile.constants?.product as string);
		if (productCode === null) return false;
		let panelIndex = profile.constants?.panelIndex ?? 0;
		if (iPanel >= 0) {
			const a = fieldStarts[iPanel];
			const b = fieldEnds[iPanel];
			if (b === a || b - a > 5) return false;
			panelIndex = 0;
			for (let i = a; i < b; i++) {
				const c = bytes[i];
				if (c < 48 || c > 57) return false;
				panelIndex = panelIndex * 10 + (c - 48);
			}
			if (panelIndex > FIELD_RANGES.panel_index.max) return false;
		}
		const refdes = cellText(bytes, iRefdes, lastRefdes, true);
		if (refdes === null) return false;
		const pad = cellText(bytes, iPad, '', false);
		if (pad === null) return false;
		const volumePct =
			iVolume >= 0 ? cellNumber(bytes, iVolume, 1, volumePctOptional, VOLUME_MIN, VOLUME_MAX) : NaN;
		const areaPct = cellNumber(bytes, iArea, 1, false, AREA_MIN, AREA_MAX);
		const heightUm = cellNumber(bytes, iHeight, lengthFactor, false, HEIGHT_MIN, HEIGHT_MAX);
		const offsetXUm = cellNumber(bytes, iOffsetX, lengthFactor, false, OFFSET_MIN, OFFSET_MAX);
		const offsetYUm = cellNumber(bytes, iOffsetY, lengthFactor, false, OFFSET_MIN, OFFSET_MAX);
		const volumeUm3 =
			iVolumeUm3 >= 0
				? cellNumber(
						bytes,
						iVolumeUm3,
						volumeFactor,
						volumeUm3Optional,
						0,
						FIELD_RANGES.volume_um3.max
					)
				: NaN;
		if (
			volumePct === undefined ||
			areaPct === undefined ||
			heightUm === undefined ||
			offsetXUm === undefined ||
			offsetYUm === undefined ||
			volumeUm3 === undefined
		)
			return false;
		let result = -1;
		const resultStart = fieldStarts[iResult];
		const resultLength = fieldEnds[iResult] - resultStart;
		for (let k = 0; k < resultExact.length; k++) {
			const word = resultExact[k][0];
			if (word.length === resultLength && bytesSpell(bytes, resultStart, word)) {
				result = resultExact[k][1];
				break;
			}
		}
		if (result < 0) return false;
		const stencil = iStencil >= 0 ? cellText(bytes, iStencil, lastStencil, false) : '';
		if (stencil === null) return false;
		const printRun = iPrintRun >= 0 ? cellText(bytes, iPrintRun, lastPrintRun, false) : '';
		if (printRun === null) return false;

		lineNo++;
		dataRows++;
		rowHasError = false;
		acceptRow(
			lineNo,
			serial,
			inspectedAtMs,
			lineCode,
			productCode,
			panelIndex,
			refdes,
			pad,
			volumePct,
			areaPct,
			heightUm,
			offsetXUm,
			offsetYUm,
			volumeUm3,
			result,
			stencil,
			printRun
		);
		return true;
	}

	/**
	 * A text cell of the byte path: `previous` again when the bytes spell it, else a new string;
	 * null when the text path must judge it (empty but required, padded, too long).
	 */
	function cellText(
		bytes: Uint8Array,
		index: number,
		previous: string,
		required: boolean
	): string | null {
		const a = byteStarts[index];
		const b = byteEnds[index];
		const length = b - a;
		if (length === 0) return required ? null : '';
		if (length === previous.length && bytesSpell(bytes, a, previous)) return previous;
		if (length > MAX_TEXT_LENGTH || bytes[a] <= 32 || bytes[b - 1] <= 32) return null;
		// Refdes, pad and serial values repeat board after board: reuse the string made last time.
		let hash = 0x811c9dc5; // FNV-1a
		for (let i = a; i < b; i++) hash = Math.imul(hash ^ bytes[i], 0x01000193);
		const slot = (hash >>> 0) & (TEXT_CACHE_SIZE - 1);
		const cached = textCache[slot];
		if (cached !== undefined && cached.length === length && bytesSpell(bytes, a, cached))
			return cached;
		const text = asciiText(bytes, a, b);
		textCache[slot] = text;
		return text;
	}

	/**
	 * A measure of the byte path, scaled to canonical units; NaN for an empty optional cell;
	 * undefined when the text path must judge it (not a plain number, out of range).
	 */
	function cellNumber(
		bytes: Uint8Array,
		index: number,
		factor: number,
		optional: boolean,
		min: number,
		max: number
	): number | undefined {
		const a = byteStarts[index];
		const b = byteEnds[index];
		if (a === b) return optional ? NaN : undefined;
		const value = parseDecimalBytes(bytes, decimalComma, a, b);
		if (value !== value) return undefined;
		const scaled = factor === 1 ? value : value * factor;
		return scaled < min || scaled > max ? undefined : scaled;
	}

	function take(): SpiRowBatch[] {
		const done = out;
		out = [];
		return done;
	}

	return {
		push(chunk) {
			if (ended || fileFailed) return take();
			let textChunk: string;
			if (typeof chunk === 'string') {
				const replacement = chunk.indexOf('\uFFFD');
				if (replacement >= 0) {
					let line = lineNo + 1;
					const before = carry + chunk.slice(0, replacement);
					for (let i = 0; i < before.length; i++) if (before.charCodeAt(i) === 10) line++;
					fileError(
						`file is not valid UTF-8 text (replacement character U+FFFD on line ${line}); it was decoded with the wrong encoding`
					);
					return take();
				}
				const nul = chunk.indexOf('\u0000');
				if (nul >= 0) {
					let line = lineNo + 1;
					const before = carry + chunk.slice(0, nul);
					for (let i = 0; i < before.length; i++) if (before.charCodeAt(i) === 10) line++;
					fileError(`file is not text: NUL character on line ${line}; is it a binary export?`);
					return take();
				}
				textChunk = chunk;
			} else {
				pushBytes(chunk);
				return take();
			}
			processText(textChunk, false);
			return take();
		},
		end() {
			if (ended) return take();
			ended = true;
			if (!fileFailed) {
				if (byteCarry !== null) {
					const finalLine = byteCarry;
					byteCarry = null;
					lineFromBytes(finalLine, 0, finalLine.length, true);
				}
				if (!fileFailed) processText('', true);
			}
			if (!fileFailed && !sawNonBlank) fileError('file is empty');
			else if (!fileFailed && dataRows === 0)
				fileError('no data rows (the file has only a header)');
			else if (!fileFailed && skipRows && rowsAccepted === 0) {
				fileError(`no valid data rows (all ${rowsRejected} rejected)`);
			}
			if (!rejected && !fileFailed) flushBatch();
			return take();
		},
		boards() {
			return boardList;
		},
		summary() {
			const ok = !fileFailed && !rejected && rowsAccepted > 0;
			return {
				ok,
				fileName,
				delimiter: header === null ? null : delimiter,
				header: header === null ? [] : (header as ResolvedHeader).names,
				dataRows,
				rowsAccepted,
				rowsRejected,
				errorCount: errors.count,
				errors: errors.list(),
				warningCount: warnings.count,
				warnings: warnings.list(),
				boards:
					rejected || fileFailed
						? []
						: boardList.map((b, i) => ({ ...b, aggregate: boardAccumulators[i].finish() }))
			};
		}
	};
}

/**
 * Drive a parser from an async source of chunks (a Node `ReadStream`, a web `ReadableStream`
 * iterated with `for await`, or an array of strings in tests), yielding each batch as soon as
 * it is complete. Read `parser.summary()` after the loop.
 * @example
 * const parser = createSpiRowParser({ profile, fileName });
 * for await (const batch of parseSpiStream(fs.createReadStream(path), parser)) insert(batch);
 * parser.summary();
 */
export async function* parseSpiStream(
	source: AsyncIterable<Uint8Array | string> | Iterable<Uint8Array | string>,
	parser: SpiRowParser
): AsyncGenerator<SpiRowBatch, void, void> {
	for await (const chunk of source) {
		for (const batch of parser.push(chunk)) yield batch;
	}
	for (const batch of parser.end()) yield batch;
}
