/** Summaries the benchmarks print (figures only; nothing here is asserted on timings). */

const ascending = (xs: number[]) => [...xs].sort((a, b) => a - b);

/** The middle value; the mean of the two middle ones for an even count; NaN for none. */
export function median(xs: number[]): number {
	if (xs.length === 0) return NaN;
	const s = ascending(xs);
	const mid = s.length >> 1;
	return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

/**
 * The q-quantile (0 < q ≤ 1) by the nearest-rank method: the smallest value with at least
 * q × n values at or below it, always one of the measured values (p95 = quantile(xs, 0.95)).
 */
export function quantile(xs: number[], q: number): number {
	if (xs.length === 0) return NaN;
	const s = ascending(xs);
	return s[Math.min(s.length - 1, Math.max(0, Math.ceil(q * s.length) - 1))];
}
