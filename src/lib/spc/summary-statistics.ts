/**
 * Basic summary statistics of a plain number array (inputs are never mutated).
 * Callers validate finiteness first; these functions assume finite numbers.
 */

/**
 * Arithmetic mean; NaN for an empty array (callers check length first).
 * @example mean([1, 2, 3]) // 2
 */
export function mean(values: readonly number[]): number {
	let sum = 0;
	for (const v of values) sum += v;
	return sum / values.length;
}

/**
 * Range max − min of a non-empty array.
 * @example range([3, 1, 4]) // 3
 */
export function range(values: readonly number[]): number {
	let lo = Infinity;
	let hi = -Infinity;
	for (const v of values) {
		if (v < lo) lo = v;
		if (v > hi) hi = v;
	}
	return hi - lo;
}

/**
 * Sample standard deviation with n − 1 in the denominator (ddof 1); 0 for one value.
 * Two-pass algorithm (mean first) to avoid the cancellation of the Σx² shortcut.
 * @example sampleStandardDeviation([2, 4, 4, 4, 5, 5, 7, 9]) // 2.138…
 */
export function sampleStandardDeviation(values: readonly number[]): number {
	if (values.length < 2) return 0;
	const m = mean(values);
	let ss = 0;
	for (const v of values) ss += (v - m) * (v - m);
	return Math.sqrt(ss / (values.length - 1));
}

/**
 * Quantile by linear interpolation between order statistics (Hyndman & Fan type 7, the
 * spreadsheet default). Used for the interquartile range in histogram binning.
 * @example quantile([1, 2, 3, 4], 0.5) // 2.5
 */
export function quantile(values: readonly number[], p: number): number {
	// A typed array sorts numerically without a comparator call per step: several times faster on
	// the chart histogram's 5,000 pad values (read on every chart request).
	const sorted = Float64Array.from(values).sort();
	const h = (sorted.length - 1) * p;
	const lo = Math.floor(h);
	const hi = Math.min(lo + 1, sorted.length - 1);
	return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}
