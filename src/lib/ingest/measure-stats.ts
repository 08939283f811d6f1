/**
 * Running count / mean / spread / extremes of one measure, updated one value at a time
 * (Welford) and combinable (Chan et al.), so per-board figures can be pooled for charts.
 */

/** Internal running state of one measure. `m2` = sum of squared deviations from the mean. */
export interface MeasureState {
	count: number;
	mean: number;
	m2: number;
	min: number;
	max: number;
}

/** Finished figures of one measure; null where undefined (no values, or sd with n < 2). */
export interface MeasureSummary {
	count: number;
	mean: number | null;
	/** Sample standard deviation (n − 1 in the denominator). */
	sd: number | null;
	min: number | null;
	max: number | null;
	range: number | null;
}

/**
 * Empty running state.
 * @example emptyMeasureState().count // 0
 */
export function emptyMeasureState(): MeasureState {
	return { count: 0, mean: 0, m2: 0, min: Infinity, max: -Infinity };
}

/**
 * Add one value in place (Welford's update; B. P. Welford, Technometrics 4(3), 1962). NaN
 * values are skipped, so a missing measure does not poison the others. Mutates `state`: it is
 * the accumulator's private state, never a caller's input.
 * @example const s = emptyMeasureState(); addMeasureValue(s, 2); addMeasureValue(s, 4); s.mean // 3
 */
export function addMeasureValue(state: MeasureState, value: number): void {
	if (value !== value) return;
	const count = state.count + 1;
	const delta = value - state.mean;
	const mean = state.mean + delta / count;
	state.m2 += delta * (value - mean);
	state.mean = mean;
	state.count = count;
	if (value < state.min) state.min = value;
	if (value > state.max) state.max = value;
}

/**
 * Combine two states into a new one (pairwise formula of Chan, Golub & LeVeque, "Algorithms for
 * computing the sample variance", The American Statistician 37(3), 1983):
 * m2 = m2a + m2b + δ²·na·nb/n with δ = mean_b − mean_a.
 * @example mergeMeasureStates({ count: 1, mean: 2, m2: 0, min: 2, max: 2 }, { count: 1, mean: 4, m2: 0, min: 4, max: 4 }).m2 // 2
 */
export function mergeMeasureStates(a: MeasureState, b: MeasureState): MeasureState {
	if (a.count === 0) return { ...b };
	if (b.count === 0) return { ...a };
	const count = a.count + b.count;
	const delta = b.mean - a.mean;
	return {
		count,
		mean: a.mean + (delta * b.count) / count,
		m2: a.m2 + b.m2 + (delta * delta * a.count * b.count) / count,
		min: Math.min(a.min, b.min),
		max: Math.max(a.max, b.max)
	};
}

/**
 * Finished figures from a state.
 * @example summariseMeasure({ count: 2, mean: 3, m2: 2, min: 2, max: 4 }) // { count: 2, mean: 3, sd: 1.4142135623730951, min: 2, max: 4, range: 2 }
 */
export function summariseMeasure(state: MeasureState): MeasureSummary {
	if (state.count === 0) {
		return { count: 0, mean: null, sd: null, min: null, max: null, range: null };
	}
	return {
		count: state.count,
		mean: state.mean,
		// m2 can come out a hair below 0 for constant data through rounding; clamp.
		sd: state.count < 2 ? null : Math.sqrt(Math.max(0, state.m2) / (state.count - 1)),
		min: state.min,
		max: state.max,
		range: state.max - state.min
	};
}

/**
 * Rebuild a running state from stored figures (count, mean, sd, min, max), so aggregates read
 * back from the database can be pooled with `mergeMeasureStates`. m2 = sd²·(n − 1).
 * @example stateFromSummary({ count: 2, mean: 3, sd: Math.SQRT2, min: 2, max: 4, range: 2 }).m2 // ≈ 2
 */
export function stateFromSummary(summary: MeasureSummary): MeasureState {
	if (summary.count === 0 || summary.mean === null) return emptyMeasureState();
	const sd = summary.sd ?? 0;
	return {
		count: summary.count,
		mean: summary.mean,
		m2: sd * sd * (summary.count - 1),
		min: summary.min ?? summary.mean,
		max: summary.max ?? summary.mean
	};
}
