/**
 * Tokenising of the SPI parser: the file's pieces (bytes or text) → physical lines → records →
 * cells. One path for both inputs: bytes are cut at their last line feed and decoded as strict
 * UTF-8 (a line, and so a character, never falls across two decodes), then read exactly as text.
 *
 * Per line: BOM and CR are dropped, blank lines skipped; lines without `"` are split in place by
 * `indexOf` (the hot path: no substring per cell), lines with quotes by an RFC 4180 reader (a
 * quoted field may span lines). The first record is the header; its delimiter is the profile's
 * or detected from a sample of the file. Budgets (line length, columns) are counted before the
 * work they bound.
 */
import { detectDelimiter, type Delimiter } from './detect-delimiter';
import { formatByteLimit, SPI_PARSE_LIMIT_ENV } from './parse-limits';
import { scanFieldBounds, splitQuotedLine } from './split-delimited-line';

/**
 * The cells of one record, read in place: cell i is `text.slice(starts[i], ends[i])` for
 * i < min(count, starts.length). One view, refilled for every record.
 */
export interface SpiCells {
	text: string;
	starts: Int32Array;
	ends: Int32Array;
	/** The record's true field count (may exceed the header's: only that many are set). */
	count: number;
}

/** What the tokenizer hands on. Rows are file lines (header = 1; 0 = the file as a whole). */
export interface SpiTokenSink {
	/** The header record, split, and the delimiter the data records are split by. */
	header(names: string[], delimiter: Delimiter): void;
	/** One data record (the view is reused: read it before returning). */
	record(cells: SpiCells, row: number): void;
	/** A data record that cannot be split into cells (bad quoting): a bad row. */
	badRecord(row: number, message: string): void;
	/** The file cannot be read on; the sink calls `stop()` (nothing more is read). */
	fileError(row: number, message: string): void;
}

/** Options of `createSpiTokenizer`. */
export interface SpiTokenizerOptions {
	/** The profile's delimiter, or null to detect it from the header and the lines after it. */
	delimiter: Delimiter | null;
	/** Longest physical line in bytes (text input counts UTF-16 units). */
	maxLineBytes: number;
	/** Most columns in the header. */
	maxColumns: number;
}

/** A push-driven tokenizer for one file. */
export interface SpiTokenizer {
	/** Feed the next piece of the file (bytes, decoded as strict UTF-8, or text). */
	push(chunk: Uint8Array | string): void;
	/** End of file: the last line and any unterminated quoted record. */
	end(): void;
	/** Read nothing more (called by the sink on a file-level error). */
	stop(): void;
	/** The delimiter in use; null until the header is read (when detected). */
	readonly delimiter: Delimiter | null;
	/** Whether a non-blank record (the header) was read. */
	readonly sawRecord: boolean;
	/** Whether the header has been handed on. */
	readonly sawHeader: boolean;
}

// A quoted field may span lines; past this the quote is surely unterminated.
const MAX_RECORD_LINES = 50;
const MAX_RECORD_CHARS = 65536;
// The header comes with up to this much of what follows, for delimiter detection.
const SAMPLE_CHARS = 16384;

/**
 * Offset of the first byte that breaks UTF-8 (RFC 3629 §4 syntax: no overlongs, no surrogates,
 * ≤ U+10FFFF), or -1 when the bytes are valid up to a possibly cut-off final sequence.
 * @example firstInvalidUtf8Byte(new Uint8Array([0x41, 0xff])) // 1
 */
export function firstInvalidUtf8Byte(bytes: Uint8Array): number {
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

/** UTF-8 length in bytes of text[start, end) (valid text: lone surrogates count 3). */
function utf8Length(text: string, start: number, end: number): number {
	let bytes = 0;
	for (let i = start; i < end; i++) {
		const c = text.charCodeAt(i);
		if (c < 0x80) bytes += 1;
		else if (c < 0x800) bytes += 2;
		else if (c >= 0xd800 && c <= 0xdbff && i + 1 < end) {
			bytes += 4;
			i++;
		} else bytes += 3;
	}
	return bytes;
}

function hex(byte: number): string {
	return `0x${byte.toString(16).toUpperCase().padStart(2, '0')}`;
}

/**
 * Create the tokenizer of one file; it calls `sink` for the header, each record and each
 * problem, in file order. Only the unfinished line is kept between pieces, so memory does not
 * grow with the file.
 * @example
 * const t = createSpiTokenizer({ delimiter: null, maxLineBytes: 1 << 20, maxColumns: 1000 }, sink);
 * t.push(new TextEncoder().encode('a,b\n1,2\n')); t.end(); // sink.header(['a','b'], ','), sink.record(…, 2)
 */
export function createSpiTokenizer(options: SpiTokenizerOptions, sink: SpiTokenSink): SpiTokenizer {
	const { maxLineBytes, maxColumns } = options;
	let delimiter = options.delimiter;
	let stopped = false;
	let lineNo = 0;
	let sawRecord = false;
	let headerDone = false;
	let headerCount = 0;
	const cells: SpiCells = {
		text: '',
		starts: new Int32Array(0),
		ends: new Int32Array(0),
		count: 0
	};

	// Text: the unfinished last line, and whether the BOM check is still due.
	let carry = '';
	let firstText = true;
	// Line lengths of byte input are budgeted in bytes, of text input in UTF-16 units.
	let byteInput = false;
	// Bytes: the unfinished last line and the file offset of the first byte not yet decoded.
	const utf8 = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true });
	let byteCarry: Uint8Array | null = null;
	let bytesSeen = 0;
	let decodedBytes = 0;
	// Multi-line quoted record being assembled.
	let pending = '';
	let pendingStart = 0;
	let pendingLines = 0;
	// Position of the next '"' in the current text (-1: none left), so each line's quote test
	// does not rescan the rest of the chunk.
	let quoteAt = -1;
	let quoteFrom = Infinity;

	function fileError(row: number, message: string): void {
		sink.fileError(row, message);
		stopped = true;
		byteCarry = null;
		carry = '';
	}

	/** The next physical line (`lineNo + 1`) is over the line budget: the file is refused. */
	function lineTooLong(): void {
		const row = lineNo + 1;
		fileError(
			row,
			`line ${row} is longer than the limit of ${formatByteLimit(maxLineBytes)} (${SPI_PARSE_LIMIT_ENV.maxLineBytes}); is this a text export with line breaks?`
		);
	}

	/** Whether text[start, end) is over the line budget (bytes for byte input). */
	function overBudget(text: string, start: number, end: number): boolean {
		const units = end - start;
		if (units > maxLineBytes) return true;
		// A UTF-16 unit is at most 3 bytes of UTF-8: only long lines need counting.
		if (!byteInput || units * 3 <= maxLineBytes) return false;
		return utf8Length(text, start, end) > maxLineBytes;
	}

	function readHeader(record: string, sample: string): void {
		const d = (delimiter ??= detectDelimiter(sample));
		// Count the columns before splitting (a delimiter inside quotes only over-counts).
		let columns = 1;
		for (let at = record.indexOf(d); at >= 0; at = record.indexOf(d, at + 1)) columns++;
		if (columns > maxColumns && record.indexOf('"') < 0) return tooManyColumns(columns);
		const split = record.indexOf('"') < 0 ? record.split(d) : splitQuotedLine(record, d).fields;
		if (!split) return fileError(lineNo, 'header line has an unterminated quote');
		if (split.length > maxColumns) return tooManyColumns(split.length);
		headerDone = true;
		headerCount = split.length;
		// +1: a record with an extra field is seen as one.
		cells.starts = new Int32Array(headerCount + 1);
		cells.ends = new Int32Array(headerCount + 1);
		sink.header(split, d);
	}

	function tooManyColumns(columns: number): void {
		fileError(
			lineNo,
			`header has ${columns} columns, more than the limit of ${maxColumns} (${SPI_PARSE_LIMIT_ENV.maxColumns})`
		);
	}

	/** A data record: unquoted ones are read in place from `source[from, to)`. */
	function readRecord(source: string, from: number, to: number, row: number, quoted: boolean) {
		if (!quoted) {
			cells.text = source;
			cells.count = scanFieldBounds(
				source,
				delimiter as string,
				cells.starts,
				cells.ends,
				from,
				to
			);
		} else {
			const split = splitQuotedLine(source.slice(from, to), delimiter as string);
			if (!split.fields) return sink.badRecord(row, split.error);
			// Rare path: rejoin the unquoted cells with NUL (never in a valid file) so the cells
			// are read in place like any other record.
			cells.text = split.fields.join('\u0000');
			cells.count = scanFieldBounds(cells.text, '\u0000', cells.starts, cells.ends);
		}
		sink.record(cells, row);
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
		if (!sawRecord) {
			sawRecord = true;
			readHeader(record, sample);
		} else {
			readRecord(record, 0, record.length, row, quoted);
		}
	}

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
		if (headerDone && (quoteAt < 0 || quoteAt >= end)) {
			readRecord(data, start, end, lineNo, false); // hot path: no quote, no slicing
			return;
		}
		tryRecord(
			data.slice(start, end),
			lineNo,
			sawRecord ? '' : data.slice(start, start + SAMPLE_CHARS)
		);
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
			if (stopped) return;
			const nl = data.indexOf('\n', start);
			if (nl < 0) break;
			if (overBudget(data, start, nl)) return lineTooLong();
			const end = nl > start && data.charCodeAt(nl - 1) === 13 ? nl - 1 : nl;
			handleLine(data, start, end);
			start = nl + 1;
		}
		if (overBudget(data, start, data.length)) return lineTooLong();
		carry = data.slice(start);
		if (!final || stopped) return;
		if (carry.length > 0) {
			const last = carry.endsWith('\r') ? carry.slice(0, -1) : carry;
			carry = '';
			quoteAt = -1;
			quoteFrom = Infinity;
			handleLine(last, 0, last.length);
		}
		if (pending !== '' && !stopped) {
			const message = 'unterminated quoted field at end of file';
			pending = '';
			if (headerDone) sink.badRecord(pendingStart, message);
			else fileError(pendingStart, message);
		}
	}

	/**
	 * Decode whole lines of byte input (`unit` ends with a line feed) and read them. Invalid
	 * UTF-8 is a file error naming the byte, its offset and its line, after the lines before it
	 * were read (as they would have been had the file ended there).
	 */
	function decodeLines(unit: Uint8Array): void {
		const offset = decodedBytes;
		decodedBytes += unit.length;
		let text: string;
		try {
			text = utf8.decode(unit);
		} catch {
			// Error path only. The line feed ends the unit, so a sequence cut off by it is caught at
			// its first byte.
			const found = firstInvalidUtf8Byte(unit);
			// (-1 cannot happen: the unit ends with a line feed; read as its first byte then.)
			const bad = found < 0 ? 0 : found;
			const lineStart = bad <= 0 ? 0 : unit.lastIndexOf(10, bad - 1) + 1;
			if (lineStart > 0) processText(utf8.decode(unit.subarray(0, lineStart)), false);
			if (stopped) return;
			return fileError(
				0,
				`file is not valid UTF-8 text (byte ${hex(unit[bad])} at byte ${offset + bad}, line ${lineNo + 1}); save or export it as UTF-8`
			);
		}
		processText(text, false);
	}

	/**
	 * Byte input: decode the chunk up to its last line feed; keep the unfinished last line
	 * (copied: the caller may reuse its buffer). A line longer than the budget is refused
	 * before it is copied.
	 */
	function pushBytes(chunk: Uint8Array): void {
		byteInput = true;
		const nul = chunk.indexOf(0);
		if (nul >= 0) {
			let line = lineNo + 1;
			for (let i = 0; i < nul; i++) if (chunk[i] === 10) line++;
			return fileError(
				0,
				`file is not text: NUL byte at byte ${bytesSeen + nul} (line ${line}); is it a binary export?`
			);
		}
		bytesSeen += chunk.length;
		let pos = 0;
		if (byteCarry !== null) {
			const nl = chunk.indexOf(10);
			// Measured before the copy: a file without line feeds is refused, not buffered.
			if (byteCarry.length + (nl < 0 ? chunk.length : nl) > maxLineBytes) return lineTooLong();
			const upTo = nl < 0 ? chunk.length : nl + 1;
			const joined = new Uint8Array(byteCarry.length + upTo);
			joined.set(byteCarry);
			joined.set(chunk.subarray(0, upTo), byteCarry.length);
			if (nl < 0) {
				byteCarry = joined;
				return;
			}
			byteCarry = null;
			decodeLines(joined);
			if (stopped) return;
			pos = upTo;
		}
		const last = chunk.lastIndexOf(10);
		if (last >= pos) {
			decodeLines(chunk.subarray(pos, last + 1));
			if (stopped) return;
			pos = last + 1;
		}
		if (pos < chunk.length) {
			if (chunk.length - pos > maxLineBytes) return lineTooLong();
			byteCarry = chunk.slice(pos);
		}
	}

	/** Text input: a replacement character or a NUL means the file was not read as UTF-8 text. */
	function pushText(chunk: string): void {
		const replacement = chunk.indexOf('\uFFFD');
		const nul = chunk.indexOf('\u0000');
		if (replacement < 0 && nul < 0) return processText(chunk, false);
		const at = replacement >= 0 ? replacement : nul;
		let line = lineNo + 1;
		const before = carry + chunk.slice(0, at);
		for (let i = 0; i < before.length; i++) if (before.charCodeAt(i) === 10) line++;
		fileError(
			0,
			replacement >= 0
				? `file is not valid UTF-8 text (replacement character U+FFFD on line ${line}); it was decoded with the wrong encoding`
				: `file is not text: NUL character on line ${line}; is it a binary export?`
		);
	}

	return {
		push(chunk) {
			if (stopped) return;
			if (typeof chunk === 'string') pushText(chunk);
			else pushBytes(chunk);
		},
		end() {
			if (stopped) return;
			let text = '';
			if (byteCarry !== null) {
				const finalLine = byteCarry;
				byteCarry = null;
				try {
					text = utf8.decode(finalLine);
				} catch {
					const bad = firstInvalidUtf8Byte(finalLine);
					return fileError(
						0,
						bad < 0
							? 'file is not valid UTF-8 text (it ends inside a multi-byte character)'
							: `file is not valid UTF-8 text (byte ${hex(finalLine[bad])} at byte ${decodedBytes + bad}, line ${lineNo + 1}); save or export it as UTF-8`
					);
				}
			}
			processText(text, true);
		},
		stop() {
			stopped = true;
			byteCarry = null;
			carry = '';
		},
		get delimiter() {
			return delimiter;
		},
		get sawRecord() {
			return sawRecord;
		},
		get sawHeader() {
			return headerDone;
		}
	};
}
