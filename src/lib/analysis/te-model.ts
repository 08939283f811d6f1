import { AnalysisInputError } from './analysis-input-error';
import { invertSmallMatrix, solveSmall } from './small-matrix';
import { studentTQuantile } from './student-t';

/**
 * Transfer efficiency (TE) against area ratio (AR): a four-parameter logistic curve
 *
 *   TE(AR) = lower + (upper − lower) / (1 + exp(−(AR − knee)/scale))
 *
 * `upper` is the plateau at large AR, `lower` the level far below the knee, `knee` the AR at
 * which TE is half-way between them and `scale` (> 0, AR units) how sharply it falls. It follows
 * the knee that REFERENCE-FACTS §f describes (flat and high above ~0.7–0.8, falling steeply below
 * ~0.6–0.66), which a straight line cannot.
 *
 * Fit: weighted nonlinear least squares on per-bin mean TE, weight = the bin's pad count (a bin
 * mean of n pads has variance σ²/n), by Levenberg–Marquardt with Marquardt's diagonal scaling,
 * from several starting knees, keeping the smallest weighted residual sum of squares. Internally
 * the scale is fitted as ln(scale) so it stays positive; it is held at or above `MIN_SCALE_AR`
 * (a step narrower than one AR bin cannot be told from the bins). σ̂² = Σw·r²/(k − 4) with k bins,
 * so lack of fit widens the band rather than hiding.
 */
export interface TeCurve {
	upper: number;
	lower: number;
	knee: number;
	scale: number;
}

export interface TeBinPoint {
	areaRatio: number;
	te: number;
	/** Pads in the bin (the weight). */
	n: number;
}

export interface TeFit {
	model: 'logistic-4';
	coefficients: TeCurve;
	/** Covariance of (upper, lower, knee, ln scale), σ̂²·(JᵀWJ)⁻¹ at the solution. */
	covariance: number[][];
	residualSd: number;
	degreesOfFreedom: number;
	/** Σw·r² at the solution. */
	sse: number;
	iterations: number;
	bins: number;
	areaRatioMin: number;
	areaRatioMax: number;
}

export const MIN_SCALE_AR = 0.01;
export const MIN_FIT_BINS = 6;
const LN_MIN_SCALE = Math.log(MIN_SCALE_AR);

const logistic = (z: number) => (z >= 0 ? 1 / (1 + Math.exp(-z)) : Math.exp(z) / (1 + Math.exp(z)));

/** Predicted TE at one area ratio. */
export function predictTe(c: TeCurve, areaRatio: number): number {
	return c.lower + (c.upper - c.lower) * logistic((areaRatio - c.knee) / c.scale);
}

/** ∂TE/∂(upper, lower, knee, ln scale) at one AR. */
function gradient(theta: readonly number[], ar: number): number[] {
	const [u, l, k, lnS] = theta;
	const s = Math.exp(lnS);
	const z = (ar - k) / s;
	const p = logistic(z);
	const d = (u - l) * p * (1 - p);
	return [p, 1 - p, -d / s, -d * z];
}

function curveOf(theta: readonly number[]): TeCurve {
	return { upper: theta[0], lower: theta[1], knee: theta[2], scale: Math.exp(theta[3]) };
}

function weightedSse(theta: readonly number[], pts: readonly TeBinPoint[]): number {
	const c = curveOf(theta);
	let s = 0;
	for (const p of pts) s += p.n * (p.te - predictTe(c, p.areaRatio)) ** 2;
	return s;
}

function levenbergMarquardt(start: number[], pts: readonly TeBinPoint[]) {
	let theta = [...start];
	theta[3] = Math.max(theta[3], LN_MIN_SCALE);
	let sse = weightedSse(theta, pts);
	let lambda = 1e-3;
	let iterations = 0;
	for (; iterations < 200; iterations++) {
		const jtj = [0, 1, 2, 3].map(() => [0, 0, 0, 0]);
		const jtr = [0, 0, 0, 0];
		const c = curveOf(theta);
		for (const p of pts) {
			const g = gradient(theta, p.areaRatio);
			const r = p.te - predictTe(c, p.areaRatio);
			for (let i = 0; i < 4; i++) {
				jtr[i] += p.n * g[i] * r;
				for (let j = 0; j < 4; j++) jtj[i][j] += p.n * g[i] * g[j];
			}
		}
		let improved = false;
		for (let tries = 0; tries < 30; tries++) {
			const damped = jtj.map((row, i) =>
				row.map((v, j) => (i === j ? v + lambda * Math.max(v, 1e-12) : v))
			);
			const step = solveSmall(damped, jtr);
			if (!step) {
				lambda *= 10;
				continue;
			}
			const next = theta.map((t, i) => t + step[i]);
			next[3] = Math.max(next[3], LN_MIN_SCALE);
			const nextSse = weightedSse(next, pts);
			if (Number.isFinite(nextSse) && nextSse <= sse) {
				const gain = sse - nextSse;
				theta = next;
				sse = nextSse;
				lambda = Math.max(lambda / 10, 1e-12);
				improved = true;
				if (gain <= 1e-14 * (sse + 1e-300) || Math.max(...step.map(Math.abs)) < 1e-10)
					return { theta, sse, iterations: iterations + 1 };
				break;
			}
			lambda *= 10;
		}
		if (!improved) break;
	}
	return { theta, sse, iterations };
}

/** Why a curve could not be fitted (the API passes it on as the reason). */
export type TeFitOutcome = { fit: TeFit; reason: null } | { fit: null; reason: string };

/**
 * Fit the logistic TE curve to binned data.
 * @throws AnalysisInputError for non-finite values or weights ≤ 0.
 */
export function fitTeCurve(points: readonly TeBinPoint[]): TeFitOutcome {
	for (const [i, p] of points.entries()) {
		if (!Number.isFinite(p.areaRatio) || !Number.isFinite(p.te))
			throw new AnalysisInputError(`bin ${i + 1}: area ratio and TE must be finite numbers`);
		if (!(Number.isFinite(p.n) && p.n > 0))
			throw new AnalysisInputError(`bin ${i + 1}: n must be > 0`);
	}
	const pts = [...points].sort((a, b) => a.areaRatio - b.areaRatio);
	if (pts.length < MIN_FIT_BINS)
		return {
			fit: null,
			reason: `too few area-ratio bins with enough pads to fit a curve: ${pts.length}, need ${MIN_FIT_BINS}`
		};
	const arMin = pts[0].areaRatio;
	const arMax = pts[pts.length - 1].areaRatio;
	if (!(arMax - arMin > 2 * MIN_SCALE_AR))
		return { fit: null, reason: 'the bins cover too narrow a range of area ratios' };
	const tes = pts.map((p) => p.te);
	const top = pts.slice(Math.floor(pts.length * 0.67));
	const upper0 = top.reduce((s, p) => s + p.n * p.te, 0) / top.reduce((s, p) => s + p.n, 0);
	const lower0 = Math.min(...tes);
	let best: { theta: number[]; sse: number; iterations: number } | null = null;
	for (let k = 0; k <= 6; k++) {
		const knee = arMin + ((arMax - arMin) * k) / 6;
		for (const scale of [0.03, 0.1, 0.3]) {
			const run = levenbergMarquardt([upper0, lower0, knee, Math.log(scale)], pts);
			if (Number.isFinite(run.sse) && (!best || run.sse < best.sse)) best = run;
		}
	}
	if (!best) return { fit: null, reason: 'the curve fit did not converge' };
	const degreesOfFreedom = pts.length - 4;
	const s2 = best.sse / degreesOfFreedom;
	const jtj = [0, 1, 2, 3].map(() => [0, 0, 0, 0]);
	for (const p of pts) {
		const g = gradient(best.theta, p.areaRatio);
		for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) jtj[i][j] += p.n * g[i] * g[j];
	}
	const inv = invertSmallMatrix(jtj, 1e-13);
	if (!inv)
		return {
			fit: null,
			reason:
				'the data do not determine the curve (no fall in TE across the area ratios present, or too few distinct ratios around the knee)'
		};
	return {
		fit: {
			model: 'logistic-4',
			coefficients: curveOf(best.theta),
			covariance: inv.map((row) => row.map((v) => v * s2)),
			residualSd: Math.sqrt(s2),
			degreesOfFreedom,
			sse: best.sse,
			iterations: best.iterations,
			bins: pts.length,
			areaRatioMin: arMin,
			areaRatioMax: arMax
		},
		reason: null
	};
}

export interface TeBandPoint {
	areaRatio: number;
	fit: number;
	lower: number;
	upper: number;
}

/**
 * Pointwise confidence band for the mean TE by the delta method:
 * Var(TÊ(AR)) ≈ gᵀ·Cov·g with g the gradient in (upper, lower, knee, ln scale), half-width
 * t(1 − α/2, k − 4)·√Var. A first-order approximation: its coverage is checked by simulation in
 * the tests, not assumed.
 */
export function teBandAt(fit: TeFit, areaRatio: number, level = 0.95): TeBandPoint {
	const c = fit.coefficients;
	const theta = [c.upper, c.lower, c.knee, Math.log(c.scale)];
	const g = gradient(theta, areaRatio);
	let v = 0;
	for (let i = 0; i < 4; i++) for (let j = 0; j < 4; j++) v += g[i] * fit.covariance[i][j] * g[j];
	const t = studentTQuantile(1 - (1 - level) / 2, fit.degreesOfFreedom);
	const half = t * Math.sqrt(Math.max(0, v));
	const y = predictTe(c, areaRatio);
	return { areaRatio, fit: y, lower: y - half, upper: y + half };
}

/** Band grid step (AR) and the AR above which only the bins' own ratios are added. */
export const BAND_STEP_AR = 0.01;
export const BAND_DENSE_MAX_AR = 1.5;

/**
 * The band over the fitted data range: every `BAND_STEP_AR` up to `BAND_DENSE_MAX_AR` (where the
 * knee is), then at the given bin ratios above it (large openings sit on the plateau), and at the
 * largest ratio. At most ~150 + bins points.
 */
export function teBand(
	fit: TeFit,
	binAreaRatios: readonly number[] = [],
	level = 0.95
): TeBandPoint[] {
	const xs: number[] = [];
	const denseTo = Math.min(fit.areaRatioMax, BAND_DENSE_MAX_AR);
	const steps = Math.max(1, Math.ceil((denseTo - fit.areaRatioMin) / BAND_STEP_AR));
	for (let i = 0; i <= steps; i++)
		xs.push(fit.areaRatioMin + ((denseTo - fit.areaRatioMin) * i) / steps);
	for (const ar of binAreaRatios) if (ar > denseTo && ar < fit.areaRatioMax) xs.push(ar);
	if (fit.areaRatioMax > denseTo) xs.push(fit.areaRatioMax);
	return xs.sort((a, b) => a - b).map((x) => teBandAt(fit, x, level));
}

/** The site's own AR limit, or why there is none. */
export interface LearnedLimit {
	areaRatio: number | null;
	/**
	 * AR range where the band crosses the floor: [upper edge crosses, lower edge crosses]; the
	 * first is null when the upper edge stays above the floor down to the smallest AR in the data.
	 */
	interval: [number | null, number] | null;
	reason: string | null;
}

/** Largest band half-width (TE, as a fraction) at the crossing that still gives a limit. */
export const MAX_BAND_HALF_WIDTH_AT_LIMIT = 0.1;

/**
 * The area ratio below which the predicted TE falls under `floor` (e.g. 0.70), solved in closed
 * form: AR* = knee − scale·ln((upper − lower)/(floor − lower) − 1). Null, with the reason, when
 * the data cannot support one: no fit, no crossing inside the fitted AR range, or a band wider
 * than ±`MAX_BAND_HALF_WIDTH_AT_LIMIT` at the crossing or not crossing the floor inside the data.
 */
export function learnedMinAreaRatio(
	outcome: TeFitOutcome,
	floor: number,
	level = 0.95
): LearnedLimit {
	if (!(floor > 0 && floor < 3))
		throw new AnalysisInputError(`floor must be in (0, 3), got ${floor}`);
	if (!outcome.fit) return { areaRatio: null, interval: null, reason: outcome.reason };
	const fit = outcome.fit;
	const c = fit.coefficients;
	const none = (reason: string): LearnedLimit => ({ areaRatio: null, interval: null, reason });
	if (!(c.upper > c.lower)) return none('TE does not fall at small area ratios in these data');
	const atMin = predictTe(c, fit.areaRatioMin);
	const atMax = predictTe(c, fit.areaRatioMax);
	const fmt = (v: number) => v.toFixed(2);
	if (atMax < floor)
		return none(
			`predicted TE is below the floor ${fmt(floor)} over the whole data range (at most ${fmt(atMax)})`
		);
	if (atMin >= floor)
		return none(
			`predicted TE stays at or above the floor ${fmt(floor)} down to the smallest area ratio in the data (${fmt(fit.areaRatioMin)}): the limit lies below the data`
		);
	const ar = c.knee - c.scale * Math.log((c.upper - c.lower) / (floor - c.lower) - 1);
	const band = teBandAt(fit, ar, level);
	const half = (band.upper - band.lower) / 2;
	if (!(half <= MAX_BAND_HALF_WIDTH_AT_LIMIT))
		return none(
			`the confidence band is too wide at the crossing (±${half.toFixed(3)} TE, more than ±${MAX_BAND_HALF_WIDTH_AT_LIMIT})`
		);
	// Where each band edge crosses the floor, by bisection inside the data range.
	const crossing = (edge: 'lower' | 'upper'): number | null => {
		const f = (x: number) => teBandAt(fit, x, level)[edge] - floor;
		let lo = fit.areaRatioMin;
		let hi = fit.areaRatioMax;
		if (f(lo) >= 0 || f(hi) < 0) return null;
		for (let i = 0; i < 60; i++) {
			const mid = (lo + hi) / 2;
			if (f(mid) < 0) lo = mid;
			else hi = mid;
		}
		return (lo + hi) / 2;
	};
	const from = crossing('upper');
	const to = crossing('lower');
	if (to === null)
		return none(
			'the lower edge of the confidence band does not reach the floor inside the data range (band too wide)'
		);
	return { areaRatio: ar, interval: [from, to], reason: null };
}
