import { detectDelimiter, type Delimiter } from './detect-delimiter';
import { splitQuotedLine } from './split-delimited-line';

/** What the mapping screen shows of an uploaded file before a profile is chosen. */
export interface SamplePreview {
	delimiter: Delimiter;
	/** True when numbers look like `12,5` (decimal comma); only possible with ; or tab. */
	decimalCommaLikely: boolean;
	/** Header fields, trimmed, BOM removed. */
	header: string[];
	/** Up to `n` data rows, as text fields. Rows that cannot be split are left out. */
	rows: string[][];
}

const DECIMAL_COMMA = /^\s*[+-]?\d+,\d+\s*$/;

/**
 * Read the header and first `n` rows of a text sample (the first few KB of an upload) for the
 * column-mapping screen. Does not validate values. A cut-off last line is dropped when the
 * sample does not end with a line break.
 * @param delimiter a known delimiter, or omit to detect one (`detectDelimiter`).
 * @throws RangeError when `n` is not a non-negative integer.
 * @example previewSample('a;b\n1;2,5\n', 5) // { delimiter: ';', decimalCommaLikely: true, header: ['a','b'], rows: [['1','2,5']] }
 */
export function previewSample(text: string, n: number, delimiter?: Delimiter): SamplePreview {
	if (!Number.isInteger(n) || n < 0) {
		throw new RangeError(`previewSample requires a non-negative integer row count, got ${n}`);
	}
	const body = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
	const d = delimiter ?? detectDelimiter(body);
	const lines = body.split(/\r?\n/);
	if (!/\n$/.test(body) && lines.length > 1) lines.pop();
	const nonEmpty = lines.filter((l) => l.trim() !== '');
	const headerSplit = nonEmpty.length > 0 ? splitQuotedLine(nonEmpty[0], d) : null;
	const header = headerSplit?.fields ? headerSplit.fields.map((h) => h.trim()) : [];
	const rows: string[][] = [];
	for (let i = 1; i < nonEmpty.length && rows.length < n; i++) {
		const split = splitQuotedLine(nonEmpty[i], d);
		if (split.fields) rows.push(split.fields);
	}
	const decimalCommaLikely =
		d !== ',' && rows.some((r) => r.some((field) => DECIMAL_COMMA.test(field)));
	return { delimiter: d, decimalCommaLikely, header, rows };
}
