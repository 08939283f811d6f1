/**
 * Split one delimited record into fields. Two paths: a fast one for records without quotes
 * (`indexOf` scanning, boundaries only) and an RFC 4180 reader for quoted fields.
 * Reference: RFC 4180 §2 (https://www.rfc-editor.org/rfc/rfc4180#section-2).
 */

/** Result of splitting a record: the fields, or an error message. */
export type SplitResult =
	| { fields: string[]; error: null; unterminated: false }
	| { fields: null; error: string; unterminated: boolean };

/**
 * Find the field boundaries of a record without quote characters: field i is
 * `line.slice(starts[i], ends[i])`. Writes at most `starts.length` boundaries (reused arrays,
 * no allocation) and returns the true field count, which may be larger. `from`/`to` select one
 * line of a larger text, so lines need not be cut out either. Used on the hot path for every
 * unquoted line; cells are then read in place.
 * @example
 * const s = new Int32Array(8), e = new Int32Array(8);
 * scanFieldBounds('a,bb,,c', ',', s, e) // 4; s = [0,2,5,6], e = [1,4,5,7]
 */
export function scanFieldBounds(
	line: string,
	delimiter: string,
	starts: Int32Array,
	ends: Int32Array,
	from = 0,
	to = line.length
): number {
	const capacity = starts.length;
	let count = 0;
	let start = from;
	for (;;) {
		let next = line.indexOf(delimiter, start);
		if (next >= to) next = -1;
		const end = next < 0 ? to : next;
		if (count < capacity) {
			starts[count] = start;
			ends[count] = end;
		}
		count++;
		if (next < 0) return count;
		start = next + 1;
	}
}

/**
 * Split a record that may contain RFC 4180 quoted fields: `"a,b"`, `"say ""hi"""`, and line
 * breaks inside quotes. Spaces around a quoted field are tolerated (some exporters pad them);
 * a quote inside an unquoted field is kept as text. `unterminated` tells the caller the record
 * may continue on the next line.
 * Used for the lines the fast path cannot take.
 * @example splitQuotedLine('"RB-1, rev B",C1,"2 ""x"""', ',') // fields: ['RB-1, rev B', 'C1', '2 "x"']
 * @example splitQuotedLine('"open,C1', ',').error // 'unterminated quoted field (field 1)'
 */
export function splitQuotedLine(line: string, delimiter: string): SplitResult {
	const fields: string[] = [];
	let i = 0;
	const n = line.length;
	for (;;) {
		// Start of a field: skip blanks only if a quote follows.
		let j = i;
		while (j < n && line[j] === ' ') j++;
		if (j < n && line[j] === '"') {
			let value = '';
			let k = j + 1;
			let closed = false;
			while (k < n) {
				const q = line.indexOf('"', k);
				if (q < 0) break;
				value += line.slice(k, q);
				if (line[q + 1] === '"') {
					value += '"';
					k = q + 2;
				} else {
					k = q + 1;
					closed = true;
					break;
				}
			}
			if (!closed) {
				return {
					fields: null,
					error: `unterminated quoted field (field ${fields.length + 1})`,
					unterminated: true
				};
			}
			while (k < n && line[k] === ' ') k++;
			fields.push(value);
			if (k >= n) return { fields, error: null, unterminated: false };
			if (line[k] !== delimiter) {
				return {
					fields: null,
					error: `text after closing quote in field ${fields.length}`,
					unterminated: false
				};
			}
			i = k + 1;
			continue;
		}
		const next = line.indexOf(delimiter, i);
		// A quote inside an unquoted field (e.g. 5" for inches) is kept as text, as most readers do.
		fields.push(next < 0 ? line.slice(i) : line.slice(i, next));
		if (next < 0) return { fields, error: null, unterminated: false };
		i = next + 1;
	}
}
