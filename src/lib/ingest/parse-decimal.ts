/**
 * Strict decimal reader for numeric cells: plain decimal notation only, equal to `Number()` on
 * the forms it accepts (and NaN for the many others `Number()` would take).
 */

// Powers of ten that are exact doubles (10^22 is the largest).
const POW10 = [
	1, 1e1, 1e2, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15, 1e16, 1e17,
	1e18, 1e19, 1e20, 1e21, 1e22
];

/**
 * Read a numeric cell strictly: plain decimal notation only, so a value is never taken from a
 * form a person would not read as that number. Accepted: ASCII spaces around; one optional sign
 * (`+` or `-`); ASCII digits with at most one decimal mark — `.`, or `,` with `decimalComma`
 * (then `.` is refused: in such exports it is a thousands separator, and `1.234` would be read
 * 1000× too small); at least one digit; an optional exponent `e`/`E`, optional sign and 1–3
 * digits; a finite result. Everything else is NaN: `0x10`, `0b11`, `0o17`, `1_000`, `Infinity`,
 * `NaN`, `+-1`, full-width or other non-ASCII digits, tabs or no-break spaces around, `1e400`.
 * (`Number()` alone would read `0x10` as 16 and `' \t12\u00a0'` as 12.)
 *
 * Exactness: with at most 15 significant digits the digits form an exact integer m < 2^53, and
 * m / 10^k (k ≤ 22) is one correctly rounded IEEE division of two exact values, which is the
 * double nearest the decimal, i.e. what `Number()` returns (Clinger's fast path: W. D. Clinger,
 * "How to Read Floating Point Numbers Accurately", PLDI 1990). Other accepted inputs (longer,
 * with `+`, exponent or padding) are checked by hand, then read by `Number()`.
 * Reads `text` from `start` to `end` (exclusive) so cells need not be cut out of the line first.
 * Faster than `Number()` and allocation-free on typical cells; used for every measure of every
 * row.
 * @example parseDecimal('-12.50', false) // -12.5
 * @example parseDecimal('101,25', true) // 101.25
 * @example parseDecimal('0x10', false) // NaN
 * @example parseDecimal('', false) // NaN
 */
export function parseDecimal(
	text: string,
	decimalComma: boolean,
	start = 0,
	end = text.length
): number {
	const n = end;
	const mark = decimalComma ? 44 : 46;
	let i = start;
	let negative = false;
	if (n <= start) return NaN;
	let c = text.charCodeAt(start);
	if (c === 45) {
		negative = true;
		i = start + 1;
	}
	let mantissa = 0;
	let digits = 0;
	let fraction = -1; // digits after the mark, -1 = no mark seen
	for (; i < n; i++) {
		c = text.charCodeAt(i);
		if (c >= 48 && c <= 57) {
			mantissa = mantissa * 10 + (c - 48);
			if (mantissa !== 0) digits++;
			if (fraction >= 0) fraction++;
		} else if (c === mark && fraction < 0) {
			fraction = 0;
		} else {
			return slowPath(text, start, end, mark);
		}
	}
	const digitCount = i - start - (negative ? 1 : 0) - (fraction >= 0 ? 1 : 0);
	if (digitCount === 0 || digits > 15 || fraction > 22) {
		return slowPath(text, start, end, mark);
	}
	const value = fraction > 0 ? mantissa / POW10[fraction] : mantissa;
	return negative ? -value : value;
}

/** Check `text[start, end)` against the strict grammar by hand, then read it with `Number()`. */
function slowPath(text: string, start: number, end: number, mark: number): number {
	while (start < end && text.charCodeAt(start) === 32) start++;
	while (end > start && text.charCodeAt(end - 1) === 32) end--;
	let i = start;
	let c = text.charCodeAt(i);
	if (c === 43 || c === 45) i++;
	let digits = 0;
	let markAt = -1;
	for (; i < end; i++) {
		c = text.charCodeAt(i);
		if (c >= 48 && c <= 57) digits++;
		else if (c === mark && markAt < 0) markAt = i;
		else break;
	}
	if (digits === 0) return NaN;
	if (i < end && (c === 101 || c === 69)) {
		i++;
		c = text.charCodeAt(i);
		if (c === 43 || c === 45) i++;
		const from = i;
		while (i < end && (c = text.charCodeAt(i)) >= 48 && c <= 57) i++;
		if (i === from || i - from > 3) return NaN;
	}
	if (i !== end) return NaN;
	let plain = text.slice(start, end);
	if (markAt >= 0 && mark !== 46)
		plain = plain.slice(0, markAt - start) + '.' + plain.slice(markAt - start + 1);
	const value = +plain;
	// value - value is 0 only for finite numbers (NaN and ±Infinity give NaN).
	return value - value === 0 ? value : NaN;
}

/**
 * `parseDecimal` for ASCII bytes, plain forms only: optional `-`, digits, optional decimal mark
 * (`.`, or `,` instead with `decimalComma`) and digits, at most 15 significant digits. Anything else
 * (empty, `+`, exponent, padding, longer numbers) gives NaN, and the caller reads the cell as
 * text instead. Same exactness argument as `parseDecimal` (Clinger's fast path), so both give the
 * same double for every input this one accepts. Used by the parser's byte path on every measure.
 * @example parseDecimalBytes(new TextEncoder().encode('-12.50'), false, 0, 6) // -12.5
 * @example parseDecimalBytes(new TextEncoder().encode('1e3'), false, 0, 3) // NaN (text path)
 */
export function parseDecimalBytes(
	bytes: Uint8Array,
	decimalComma: boolean,
	start: number,
	end: number
): number {
	const mark = decimalComma ? 44 : 46;
	let i = start;
	let negative = false;
	if (i < end && bytes[i] === 45) {
		negative = true;
		i++;
	}
	let mantissa = 0;
	let significant = 0;
	let digitCount = 0;
	let fraction = -1;
	for (; i < end; i++) {
		const c = bytes[i];
		if (c >= 48 && c <= 57) {
			mantissa = mantissa * 10 + (c - 48);
			digitCount++;
			if (mantissa !== 0) significant++;
			if (fraction >= 0) fraction++;
		} else if (c === mark && fraction < 0) {
			fraction = 0;
		} else {
			return NaN;
		}
	}
	if (digitCount === 0 || significant > 15 || fraction > 22) return NaN;
	const value = fraction > 0 ? mantissa / POW10[fraction] : mantissa;
	return negative ? -value : value;
}
