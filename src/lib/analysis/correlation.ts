import { inverseNormalCdf } from '$lib/spc/inverse-normal-cdf';
import { AnalysisInputError } from './analysis-input-error';

/** Pearson's r with its Fisher-z confidence interval. */
export interface Correlation {
	n: number;
	r: number;
	/** Interval bounds; null when n ≤ 3 (the interval needs n − 3 > 0) or |r| = 1. */
	lower: number | null;
	upper: number | null;
	level: number;
}

/**
 * Pearson's correlation coefficient (centred two-pass sums) and its approximate confidence
 * interval by Fisher's transform: z = atanh(r) ± z(1 − α/2)/√(n − 3), mapped back with tanh
 * (Fisher 1921; REFERENCE-FACTS §g). A correlation across runs says nothing of cause.
 * @throws AnalysisInputError for fewer than 3 points, mismatched lengths, non-finite values or
 *   a series without spread.
 * @example pearsonCorrelation([1, 2, 3, 4], [2, 4, 5, 9]).r
 */
export function pearsonCorrelation(
	x: readonly number[],
	y: readonly number[],
	level = 0.95
): Correlation {
	if (x.length !== y.length)
		throw new AnalysisInputError(`x has ${x.length} values, y ${y.length}`);
	if (!(level > 0 && level < 1))
		throw new AnalysisInputError(`level must be in (0, 1), got ${level}`);
	const n = x.length;
	if (n < 3) throw new AnalysisInputError(`a correlation needs 3 points, got ${n}`);
	let sx = 0;
	let sy = 0;
	for (let i = 0; i < n; i++) {
		if (!Number.isFinite(x[i]) || !Number.isFinite(y[i]))
			throw new AnalysisInputError(`point ${i + 1} is not a finite number`);
		sx += x[i];
		sy += y[i];
	}
	const mx = sx / n;
	const my = sy / n;
	let sxx = 0;
	let syy = 0;
	let sxy = 0;
	for (let i = 0; i < n; i++) {
		const dx = x[i] - mx;
		const dy = y[i] - my;
		sxx += dx * dx;
		syy += dy * dy;
		sxy += dx * dy;
	}
	if (!(sxx > 0) || !(syy > 0)) throw new AnalysisInputError('a series has no spread');
	const r = Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)));
	if (n <= 3 || Math.abs(r) === 1) return { n, r, lower: null, upper: null, level };
	const z = Math.atanh(r);
	const half = inverseNormalCdf(1 - (1 - level) / 2) / Math.sqrt(n - 3);
	return { n, r, lower: Math.tanh(z - half), upper: Math.tanh(z + half), level };
}
