/**
 * Low-level CSV reading shared by the aperture and centroid importers: papaparse with a fixed
 * comma delimiter, rows tagged with the file line they start on (header = line 1), blank lines
 * and `#` comment lines skipped, header names normalised.
 */
import Papa from 'papaparse';
import { formatProblem } from './stencil-input-error';

/** One CSV import error: `row` = file line (header = 1); `column` null for whole-row errors. */
export interface CsvError {
	row: number;
	column: string | null;
	message: string;
}

/** A data row: its starting line number and its cells keyed by normalised column name. */
export interface CsvRow {
	line: number;
	cells: Record<string, string>;
}

/** At most this many errors are listed; a last entry says how many more there were. */
export const MAX_CSV_ERRORS = 100;

/**
 * Build a `CsvError` whose message repeats the location in the one message format
 * (`line 5, width: must be a number (got "abc")`), so it reads well on its own.
 * @example csvError(5, 'width', 'must be a number') // { row: 5, column: 'width', message: 'line 5, width: must be a number' }
 */
export function csvError(row: number, column: string | null, message: string): CsvError {
	const text = formatProblem({ where: `line ${row}`, field: column ?? 'row', message });
	return { row, column, message: text };
}

/**
 * Normalise a header cell: trimmed, lower case, spaces and dashes as underscores, and a unit
 * suffix in brackets dropped (`Corner Radius (mm)` → `corner_radius`).
 * @example normaliseHeader(' Corner-Radius (mm) ') // 'corner_radius'
 */
export function normaliseHeader(cell: string): string {
	return cell
		.replace(/\(.*?\)|\[.*?\]/g, '')
		.trim()
		.toLowerCase()
		.replace(/[\s-]+/g, '_');
}

/**
 * Parse CSV text into a header and data rows with line numbers.
 * @param aliases map from accepted header spellings to the canonical column name.
 * @returns `{ header, rows }`, or `{ errors }` for an empty file, a quoting error, a duplicated
 *   column or more than `maxRows` data rows.
 * @example readCsvRows('refdes,x\nU1,5\n') // { header: ['refdes','x'], rows: [{ line: 2, cells: { refdes: 'U1', x: '5' } }] }
 */
export function readCsvRows(
	text: string,
	maxRows: number,
	aliases: Record<string, string> = {}
): { header: string[]; rows: CsvRow[] } | { errors: CsvError[] } {
	const src = text.replace(/^\uFEFF/, '').replace(/\r\n?/g, '\n');
	// NUL and other control bytes, or U+FFFD (what decoding invalid UTF-8 leaves), mean a binary
	// or mis-encoded file: refused with where, never stored in a refdes.
	const bad = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F\uFFFD]/.exec(src);
	if (bad) {
		let line = 1;
		let lineStart = 0;
		for (let i = 0; i < bad.index; i++)
			if (src.charCodeAt(i) === 10) {
				line++;
				lineStart = i + 1;
			}
		const code = bad[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0');
		const what =
			bad[0] === '\uFFFD' ? 'bytes that are not valid UTF-8' : `a control character (U+${code})`;
		const message = `column ${bad.index - lineStart + 1} holds ${what}; the file must be UTF-8 text`;
		return { errors: [csvError(line, null, message)] };
	}
	const errors: CsvError[] = [];
	let header: string[] | null = null;
	let headerLine = 1;
	const rows: CsvRow[] = [];
	let pos = 0;
	let line = 1;
	let nextStart = 0;
	let tooMany = false;
	Papa.parse<string[]>(src, {
		delimiter: ',',
		newline: '\n',
		step: (result) => {
			const start = nextStart;
			for (let i = pos; i < start; i++) if (src.charCodeAt(i) === 10) line++;
			pos = start;
			nextStart = result.meta.cursor + 1;
			const cells = result.data;
			for (const e of result.errors)
				if (errors.length < MAX_CSV_ERRORS) errors.push(csvError(line, null, e.message));
			const blank = cells.every((c) => c.trim() === '');
			if (blank || cells[0].trim().startsWith('#')) return;
			if (header === null) {
				header = cells.map((c) => {
					const n = normaliseHeader(c);
					return aliases[n] ?? n;
				});
				headerLine = line;
				return;
			}
			if (rows.length >= maxRows) {
				tooMany = true;
				return;
			}
			const record: Record<string, string> = {};
			header.forEach((name, k) => {
				if (name) record[name] = (cells[k] ?? '').trim();
			});
			if (cells.length > header.length && cells.slice(header.length).some((c) => c.trim() !== ''))
				errors.push(
					csvError(
						line,
						null,
						`has ${cells.length} cells but the header has ${header.length} columns`
					)
				);
			rows.push({ line, cells: record });
		}
	});
	if (header === null) return { errors: [csvError(1, null, 'the file is empty (no header row)')] };
	const seen = new Set<string>();
	for (const name of header as string[]) {
		if (name && seen.has(name))
			errors.push(csvError(headerLine, name, 'column appears twice in the header'));
		seen.add(name);
	}
	if (tooMany)
		errors.push(csvError(headerLine, null, `the file has more than ${maxRows} data rows`));
	if (errors.length > 0) return { errors: errors.slice(0, MAX_CSV_ERRORS) };
	return { header: header as string[], rows };
}

/** Strict decimal number syntax (no hex, no empty string, no thousands separators). */
const NUMBER_RE = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Parse a numeric cell; returns null (with no throw) when it is not a plain decimal number.
 * @example parseNumberCell(' 1.5e2 ') // 150
 */
export function parseNumberCell(cell: string): number | null {
	const t = cell.trim();
	return NUMBER_RE.test(t) ? Number(t) : null;
}
