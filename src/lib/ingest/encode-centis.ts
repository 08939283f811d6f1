/**
 * Fixed-point storage of measured values as integers in hundredths ("centis"): 101.25 % → 10125,
 * -12.5 µm → -1250. Integers are compact in SQLite (1–4 bytes for these ranges) and compare
 * exactly.
 *
 * Round trip: for any input written with at most 2 decimals, `decodeCentis(encodeCentis(x))`
 * is the same double as `Number(text)`. Why: x·100 is within a few ulps of the integer k, so
 * `Math.round` gives k exactly; k/100 is then the correctly rounded quotient of the exact
 * decimal, which is what `Number(text)` returns too (IEEE 754 division and decimal parsing
 * both round to nearest). Inputs with more decimals are rounded to the nearest hundredth,
 * halves toward +∞ as `Math.round` does (0.125 → 13, −0.125 → −12).
 */

/**
 * Encode a value as an integer count of hundredths. Used by the ingest service before writing
 * pad rows. Negative zero is returned as 0.
 * @throws RangeError when `value` is NaN/infinite or |value·100| exceeds 2^53 − 1.
 * @example encodeCentis(101.25) // 10125
 * @example encodeCentis(-0.07) // -7
 */
export function encodeCentis(value: number): number {
	const scaled = Math.round(value * 100);
	if (!Number.isSafeInteger(scaled)) {
		throw new RangeError(`encodeCentis requires a finite value within ±9.0e13, got ${value}`);
	}
	return scaled === 0 ? 0 : scaled;
}

/**
 * Decode hundredths back to the value. Used when reading pad rows for charts.
 * @throws RangeError when `centis` is not a safe integer.
 * @example decodeCentis(10125) // 101.25
 */
export function decodeCentis(centis: number): number {
	if (!Number.isSafeInteger(centis)) {
		throw new RangeError(`decodeCentis requires a safe integer, got ${centis}`);
	}
	return centis / 100;
}
