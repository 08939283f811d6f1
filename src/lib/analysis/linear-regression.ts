import { AnalysisInputError } from './analysis-input-error';
import { studentTQuantile } from './student-t';

/**
 * A fitted straight line y = intercept + slope·x by (weighted) least squares.
 *
 * Weights are precision weights: observation i has variance σ²/wᵢ. The residual variance is
 * σ̂² = Σwᵢrᵢ²/(n − 2) with n the number of points (not Σw), as in textbook WLS; with all
 * weights 1 this is ordinary least squares and reproduces NIST's certified values.
 */
export interface LinearFit {
	n: number;
	intercept: number;
	slope: number;
	interceptSe: number;
	slopeSe: number;
	/** σ̂ = √(SSE/(n − 2)). */
	residualSd: number;
	/** Weighted residual sum of squares Σwᵢrᵢ². */
	sse: number;
	/** Weighted total sum of squares about the weighted mean. */
	sst: number;
	rSquared: number;
	degreesOfFreedom: number;
	/** Weighted mean of x, Σw and Sxx = Σwᵢ(xᵢ − x̄)²: what the mean-response band needs. */
	xMean: number;
	weightSum: number;
	sxx: number;
}

function checkSeries(x: readonly number[], y: readonly number[], w?: readonly number[]) {
	if (x.length !== y.length)
		throw new AnalysisInputError(`x has ${x.length} values, y ${y.length}`);
	if (w && w.length !== x.length)
		throw new AnalysisInputError(`weights: ${w.length} for ${x.length} points`);
	for (let i = 0; i < x.length; i++) {
		if (!Number.isFinite(x[i]) || !Number.isFinite(y[i]))
			throw new AnalysisInputError(`point ${i + 1} is not a finite number`);
		if (w && !(Number.isFinite(w[i]) && w[i] > 0))
			throw new AnalysisInputError(`weight ${i + 1} must be a finite number > 0`);
	}
}

/**
 * Least-squares straight line with standard errors. Two passes (centred sums), so data with a
 * large offset such as NIST's Norris keep their precision.
 * @throws AnalysisInputError for fewer than 3 points, mismatched lengths, non-finite values,
 *   weights ≤ 0, or x without spread.
 * @example linearRegression([1, 2, 3], [2, 4, 7]).slope // 2.5
 */
export function linearRegression(
	x: readonly number[],
	y: readonly number[],
	weights?: readonly number[]
): LinearFit {
	checkSeries(x, y, weights);
	const n = x.length;
	if (n < 3) throw new AnalysisInputError(`a line with standard errors needs 3 points, got ${n}`);
	const w = (i: number) => (weights ? weights[i] : 1);
	let sw = 0;
	let swx = 0;
	let swy = 0;
	for (let i = 0; i < n; i++) {
		sw += w(i);
		swx += w(i) * x[i];
		swy += w(i) * y[i];
	}
	const xMean = swx / sw;
	const yMean = swy / sw;
	let sxx = 0;
	let sxy = 0;
	let sst = 0;
	for (let i = 0; i < n; i++) {
		const dx = x[i] - xMean;
		const dy = y[i] - yMean;
		sxx += w(i) * dx * dx;
		sxy += w(i) * dx * dy;
		sst += w(i) * dy * dy;
	}
	if (!(sxx > 0)) throw new AnalysisInputError('x has no spread: every point has the same x');
	const slope = sxy / sxx;
	const intercept = yMean - slope * xMean;
	let sse = 0;
	for (let i = 0; i < n; i++) {
		const r = y[i] - intercept - slope * x[i];
		sse += w(i) * r * r;
	}
	const degreesOfFreedom = n - 2;
	const s2 = sse / degreesOfFreedom;
	return {
		n,
		intercept,
		slope,
		interceptSe: Math.sqrt(s2 * (1 / sw + (xMean * xMean) / sxx)),
		slopeSe: Math.sqrt(s2 / sxx),
		residualSd: Math.sqrt(s2),
		sse,
		sst,
		rSquared: sst > 0 ? 1 - sse / sst : NaN,
		degreesOfFreedom,
		xMean,
		weightSum: sw,
		sxx
	};
}

/** A two-sided confidence interval for the mean response at one x. */
export interface MeanResponseInterval {
	x: number;
	fit: number;
	lower: number;
	upper: number;
	halfWidth: number;
}

/**
 * Two-sided 100·level % confidence interval for the mean response at x0:
 * ŷ0 ± t(1 − α/2, n − 2)·σ̂·√(1/Σw + (x0 − x̄)²/Sxx) (Montgomery & Runger eq. 11-31 with w = 1).
 * Pointwise: the level holds at each x on its own, not for the whole band at once.
 * @throws AnalysisInputError when level is not in (0, 1).
 */
export function meanResponseInterval(
	fit: LinearFit,
	x0: number,
	level = 0.95
): MeanResponseInterval {
	if (!(level > 0 && level < 1))
		throw new AnalysisInputError(`level must be in (0, 1), got ${level}`);
	const t = studentTQuantile(1 - (1 - level) / 2, fit.degreesOfFreedom);
	const se = fit.residualSd * Math.sqrt(1 / fit.weightSum + (x0 - fit.xMean) ** 2 / fit.sxx);
	const yHat = fit.intercept + fit.slope * x0;
	return { x: x0, fit: yHat, lower: yHat - t * se, upper: yHat + t * se, halfWidth: t * se };
}

/**
 * The pointwise band at `count` evenly spaced x from `from` to `to` (count ≥ 2).
 * @example meanResponseBand(fit, 0, 1, 21)
 */
export function meanResponseBand(
	fit: LinearFit,
	from: number,
	to: number,
	count: number,
	level = 0.95
): MeanResponseInterval[] {
	if (!(Number.isInteger(count) && count >= 2 && count <= 10000))
		throw new AnalysisInputError(`band points must be an integer 2–10000, got ${count}`);
	return Array.from({ length: count }, (_, i) =>
		meanResponseInterval(fit, from + ((to - from) * i) / (count - 1), level)
	);
}
