/**
 * Guess the field delimiter of a delimited text export from its first lines.
 */

/** Delimiters Rollbead reads. */
export type Delimiter = ',' | ';' | '\t';

// Order breaks ties: tab and semicolon are never decimal marks, comma can be.
const CANDIDATES: readonly Delimiter[] = ['\t', ';', ','];

/** Count a delimiter outside double quotes. */
function countOutsideQuotes(line: string, delimiter: string): number {
	let count = 0;
	let quoted = false;
	for (let i = 0; i < line.length; i++) {
		const c = line[i];
		if (c === '"') quoted = !quoted;
		else if (c === delimiter && !quoted) count++;
	}
	return count;
}

/**
 * Detect the delimiter (comma, semicolon or tab) of a sample (header plus a few rows).
 * A candidate is consistent when it appears the same number of times (> 0, outside quotes) on
 * the header and each of the next lines (up to 20). The consistent candidate with the most
 * fields wins; ties go tab, then semicolon, then comma. This handles decimal-comma files
 * with semicolons: their header has no commas, so the comma count is not consistent.
 * Falls back to the candidate most frequent on the header line, then to comma.
 * Used for `delimiter: 'auto'` profiles and on the mapping screen. A UTF-8 BOM is ignored.
 * @example detectDelimiter('serial;volume\nRB-1;101,5\nRB-2;99,0') // ';'
 * @example detectDelimiter('a,b\n1,2') // ','
 */
export function detectDelimiter(sampleText: string): Delimiter {
	const text = sampleText.charCodeAt(0) === 0xfeff ? sampleText.slice(1) : sampleText;
	const lines = text
		.split(/\r?\n/, 22)
		.filter((l) => l.trim() !== '')
		.slice(0, 21);
	if (lines.length === 0) return ',';
	let best: Delimiter | null = null;
	let bestCount = 0;
	for (const d of CANDIDATES) {
		const headerCount = countOutsideQuotes(lines[0], d);
		if (headerCount === 0) continue;
		// The last sampled line may be cut off mid-row, so it does not vote.
		const checked = lines.length > 2 ? lines.slice(1, -1) : lines.slice(1);
		if (checked.every((l) => countOutsideQuotes(l, d) === headerCount) && headerCount > bestCount) {
			best = d;
			bestCount = headerCount;
		}
	}
	if (best) return best;
	let fallback: Delimiter = ',';
	let fallbackCount = 0;
	for (const d of CANDIDATES) {
		const c = countOutsideQuotes(lines[0], d);
		if (c > fallbackCount) {
			fallback = d;
			fallbackCount = c;
		}
	}
	return fallback;
}
