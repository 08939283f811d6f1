/**
 * The one CSV writer for every export, on the server and in the browser (client-safe).
 *
 * RFC 4180 through papaparse's `unparse`: comma, CRLF line ends (also after the last row), and
 * a cell is quoted when it holds a comma, quote, line break or edge space (quotes doubled).
 *
 * Formula escaping: a text cell that begins with `=`, `+`, `-`, `@`, a tab or a carriage return
 * would run as a formula when the file is opened in a spreadsheet, so it is written with one
 * leading apostrophe (`'`) and quoted; the spreadsheet then shows it as text. Reading such a
 * cell back, drop that one apostrophe to get the original text. Numbers are written as numbers
 * and never escaped; nor is a negative number or a list of numbers written as text (`-12.5`,
 * `-100 50;200 -50`): digits, points, spaces and semicolons cannot call anything.
 */
import Papa from 'papaparse';

export type CsvCell = string | number | boolean | Date | null | undefined;

/** The prefix a formula-like text cell gets. */
export const FORMULA_ESCAPE = "'";

const NUMBER = String.raw`\d+(?:\.\d+)?(?:[eE][+-]?\d+)?`;
/** Text cells that start like a formula, except plain negative numbers and number lists. */
export const FORMULA_START = new RegExp(
	String.raw`^(?:[=+@\t\r]|-(?!${NUMBER}(?:[ ;]-?${NUMBER})*$))`
);

function plain(cell: CsvCell): string | number | boolean {
	if (cell === null || cell === undefined) return '';
	if (cell instanceof Date) return Number.isNaN(cell.getTime()) ? '' : cell.toISOString();
	if (typeof cell === 'number' && !Number.isFinite(cell)) return '';
	return cell;
}

/** Rows (the header is simply the first row) as CSV text, ending with CRLF. */
export function writeCsv(rows: readonly (readonly CsvCell[])[]): string {
	if (rows.length === 0) return '';
	const data = rows.map((row) => row.map(plain));
	return (
		Papa.unparse(data, { escapeFormulae: FORMULA_START, newline: '\r\n', header: false }) + '\r\n'
	);
}

/** What a text cell looks like in the file once read back: the original, maybe with the prefix. */
export function escapedText(text: string): string {
	return FORMULA_START.test(text) ? FORMULA_ESCAPE + text : text;
}

/** A CSV download answer (server): the file name is reduced to safe characters. */
export function csvResponse(csv: string, fileName: string): Response {
	const safeName = fileName.replace(/[^\w.-]+/g, '_');
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${safeName}"`
		}
	});
}
