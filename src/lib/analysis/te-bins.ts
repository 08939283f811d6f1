import { AnalysisInputError } from './analysis-input-error';
import {
	fitTeCurve,
	learnedMinAreaRatio,
	teBand,
	type LearnedLimit,
	type TeBinPoint,
	type TeFit
} from './te-model';

/**
 * Binned transfer efficiency. The database hands back, per area-ratio bin, a histogram of
 * per-pad TE in buckets of `TE_BUCKET_WIDTH` (bucket b holds TE in [b·w, (b+1)·w); TE at or
 * above `TE_BUCKET_MAX`·w goes to the last bucket) with exact sums, so millions of pads reduce
 * to a few thousand rows. Everything below works from those rows.
 *
 * Outlier rule (per bin): keep pads whose bucket midpoint lies within median ± 3 × 1.4826 × MAD
 * (median absolute deviation scaled to σ for normal data; MAD is taken as at least one bucket
 * width, the resolution). Mean, P10 and P90 are of the kept pads; `trimmed` counts the others.
 */
export const TE_BUCKET_WIDTH = 0.01;
export const TE_BUCKET_MAX = 300;
export const AREA_RATIO_BIN_WIDTH = 0.05;
/** Pads with a larger AR join the last bin (very large openings all print at the plateau). */
export const AREA_RATIO_BIN_MAX = 60;
/** Bins with fewer kept pads are shown but not fitted. */
export const MIN_PADS_PER_FITTED_BIN = 30;
export const TRIM_MADS = 3;
const MAD_TO_SIGMA = 1.4826;

/** AR bin index of one aperture. */
export function areaRatioBin(areaRatio: number): number {
	return Math.min(AREA_RATIO_BIN_MAX, Math.max(0, Math.floor(areaRatio / AREA_RATIO_BIN_WIDTH)));
}

export interface TeHistogramRow {
	bin: number;
	bucket: number;
	count: number;
	/** Σ TE of the pads in this bin and bucket (exact, not bucket midpoints). */
	teSum: number;
	/** Σ area ratio of the same pads. */
	areaRatioSum: number;
}

export interface TeBinSummary {
	/** Mean area ratio of the kept pads. */
	areaRatio: number;
	teMean: number;
	teP10: number;
	teP90: number;
	/** Pads kept after the outlier rule. */
	n: number;
	trimmed: number;
}

/** Quantile q of a histogram (sorted buckets), linear inside the bucket that holds rank q·N. */
function histogramQuantile(rows: readonly TeHistogramRow[], total: number, q: number): number {
	const target = q * total;
	let cum = 0;
	for (const r of rows) {
		if (cum + r.count >= target) {
			const frac = r.count > 0 ? (target - cum) / r.count : 0;
			return (r.bucket + Math.min(1, Math.max(0, frac))) * TE_BUCKET_WIDTH;
		}
		cum += r.count;
	}
	const last = rows[rows.length - 1];
	return (last.bucket + 1) * TE_BUCKET_WIDTH;
}

/**
 * Summarise one bin's histogram with the outlier rule above; null when it holds no pads.
 * @throws AnalysisInputError for a negative count or a bucket out of range.
 */
export function summarizeTeBin(rows: readonly TeHistogramRow[]): TeBinSummary | null {
	for (const r of rows) {
		if (!(Number.isInteger(r.count) && r.count >= 0))
			throw new AnalysisInputError(`bucket ${r.bucket}: count must be a whole number ≥ 0`);
		if (!(Number.isInteger(r.bucket) && r.bucket >= 0 && r.bucket <= TE_BUCKET_MAX))
			throw new AnalysisInputError(`bucket ${r.bucket} is outside 0–${TE_BUCKET_MAX}`);
	}
	const sorted = rows.filter((r) => r.count > 0).sort((a, b) => a.bucket - b.bucket);
	const total = sorted.reduce((s, r) => s + r.count, 0);
	if (total === 0) return null;
	const median = histogramQuantile(sorted, total, 0.5);
	// MAD from the histogram of |midpoint − median|.
	const deviations = sorted
		.map((r) => ({ d: Math.abs((r.bucket + 0.5) * TE_BUCKET_WIDTH - median), count: r.count }))
		.sort((a, b) => a.d - b.d);
	let cum = 0;
	let mad = 0;
	for (const dv of deviations) {
		cum += dv.count;
		if (cum >= total / 2) {
			mad = dv.d;
			break;
		}
	}
	const halfWindow = TRIM_MADS * MAD_TO_SIGMA * Math.max(mad, TE_BUCKET_WIDTH);
	const kept = sorted.filter(
		(r) => Math.abs((r.bucket + 0.5) * TE_BUCKET_WIDTH - median) <= halfWindow
	);
	const n = kept.reduce((s, r) => s + r.count, 0);
	const teSum = kept.reduce((s, r) => s + r.teSum, 0);
	const arSum = kept.reduce((s, r) => s + r.areaRatioSum, 0);
	return {
		areaRatio: arSum / n,
		teMean: teSum / n,
		teP10: histogramQuantile(kept, n, 0.1),
		teP90: histogramQuantile(kept, n, 0.9),
		n,
		trimmed: total - n
	};
}

export interface TeAnalysis {
	/** Pads counted (kept after trimming, over all bins). */
	n: number;
	trimmed: number;
	bins: TeBinSummary[];
	fit: {
		model: TeFit['model'];
		coefficients: TeFit['coefficients'];
		residualSd: number;
		degreesOfFreedom: number;
		/** Covariance of (upper, lower, knee, ln scale), for bands at other area ratios. */
		covariance: number[][];
		/** Area-ratio range of the fitted bins (outside it the curve extrapolates). */
		areaRatioMin: number;
		areaRatioMax: number;
		band: { areaRatio: number; fit: number; lower: number; upper: number }[];
	} | null;
	floor: number;
	learnedMinAreaRatio: number | null;
	learnedMinAreaRatioInterval: LearnedLimit['interval'];
	reason: string | null;
}

/**
 * From histogram rows to the answer of `GET /api/analysis/transfer-efficiency`: bins, the fitted
 * curve with its 95 % band, and the learned limit at `floor`.
 */
export function analyseTransferEfficiency(
	rows: readonly TeHistogramRow[],
	floor: number
): TeAnalysis {
	const byBin = new Map<number, TeHistogramRow[]>();
	for (const r of rows) {
		let list = byBin.get(r.bin);
		if (!list) byBin.set(r.bin, (list = []));
		list.push(r);
	}
	const bins: TeBinSummary[] = [];
	for (const bin of [...byBin.keys()].sort((a, b) => a - b)) {
		const s = summarizeTeBin(byBin.get(bin)!);
		if (s) bins.push(s);
	}
	const points: TeBinPoint[] = bins
		.filter((b) => b.n >= MIN_PADS_PER_FITTED_BIN)
		.map((b) => ({ areaRatio: b.areaRatio, te: b.teMean, n: b.n }));
	const outcome = fitTeCurve(points);
	const limit = learnedMinAreaRatio(outcome, floor);
	const fit = outcome.fit;
	return {
		n: bins.reduce((s, b) => s + b.n, 0),
		trimmed: bins.reduce((s, b) => s + b.trimmed, 0),
		bins,
		fit: fit && {
			model: fit.model,
			coefficients: fit.coefficients,
			residualSd: fit.residualSd,
			degreesOfFreedom: fit.degreesOfFreedom,
			covariance: fit.covariance,
			areaRatioMin: fit.areaRatioMin,
			areaRatioMax: fit.areaRatioMax,
			band: teBand(
				fit,
				points.map((p) => p.areaRatio)
			)
		},
		floor,
		learnedMinAreaRatio: limit.areaRatio,
		learnedMinAreaRatioInterval: limit.interval,
		reason: limit.reason
	};
}
