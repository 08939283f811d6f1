/**
 * Predicted transfer efficiency (TE) of an aperture from the site's own TE model (the logistic
 * curve of `$lib/analysis`, fitted once per technology on the site's SPI data), and whether the
 * site's data cover its area ratio: its AR bin (0.05 wide, as the model bins pads) was one of the
 * bins the curve was fitted to. Elsewhere the curve is an extrapolation, and the page says so.
 */
import {
	areaRatioBin,
	MIN_PADS_PER_FITTED_BIN,
	predictTe,
	type TeAnalysis,
	type TeCurve
} from '$lib/analysis';

/** What the stencil page needs of the site's TE model for one technology. */
export interface SiteTeModel {
	coefficients: TeCurve;
	/** AR bin indices (see `areaRatioBin`) that held enough pads to be fitted. */
	fittedBins: number[];
	/** Area-ratio range of the fitted bins. */
	areaRatioMin: number;
	areaRatioMax: number;
	/** Pads behind the fit, after trimming. */
	pads: number;
	/** The TE floor the learned limit is read at (default 0.70). */
	floor: number;
	learnedMinAreaRatio: number | null;
}

/**
 * The model of one TE analysis (`analyseTransferEfficiency`, the answer of
 * `GET /api/analysis/transfer-efficiency`), or null when no curve could be fitted. A bin counts as
 * fitted under the analysis's own rule (at least `MIN_PADS_PER_FITTED_BIN` pads kept).
 * @example siteTeModel(analyseTransferEfficiency(rows, 0.7))?.fittedBins // [10, 11, …]
 */
export function siteTeModel(analysis: TeAnalysis): SiteTeModel | null {
	if (!analysis.fit) return null;
	return {
		coefficients: analysis.fit.coefficients,
		fittedBins: analysis.bins
			.filter((b) => b.n >= MIN_PADS_PER_FITTED_BIN)
			.map((b) => areaRatioBin(b.areaRatio)),
		areaRatioMin: analysis.fit.areaRatioMin,
		areaRatioMax: analysis.fit.areaRatioMax,
		pads: analysis.n,
		floor: analysis.floor,
		learnedMinAreaRatio: analysis.learnedMinAreaRatio
	};
}

/** One aperture's predicted TE and whether the data cover its area ratio. */
export interface AperturePrediction {
	predictedTe: number;
	covered: boolean;
}

/**
 * Predict one aperture's TE at its area ratio. A non-finite area ratio (an invalid stored
 * aperture) predicts NaN and is never covered.
 * @example predictApertureTe({ coefficients: { upper: 0.9, lower: 0.3, knee: 0.6, scale: 0.05 }, fittedBins: [12], … }, 0.6)
 * // { predictedTe: 0.6, covered: true }
 */
export function predictApertureTe(model: SiteTeModel, areaRatio: number): AperturePrediction {
	if (!Number.isFinite(areaRatio)) return { predictedTe: NaN, covered: false };
	return {
		predictedTe: predictTe(model.coefficients, areaRatio),
		covered: model.fittedBins.includes(areaRatioBin(areaRatio))
	};
}

/** Counts over a stencil: apertures inside / outside the data, and predicted below the floor. */
export interface TeCoverage {
	covered: number;
	outside: number;
	belowFloor: number;
}

/**
 * Count a stencil's apertures by coverage and by predicted TE below the model's floor. O(n).
 * @example teCoverage(model, [0.6, 0.4]) // { covered: 1, outside: 1, belowFloor: 2 }
 */
export function teCoverage(model: SiteTeModel, areaRatios: readonly number[]): TeCoverage {
	const bins = new Set(model.fittedBins);
	const out: TeCoverage = { covered: 0, outside: 0, belowFloor: 0 };
	for (const ar of areaRatios) {
		if (!Number.isFinite(ar)) {
			out.outside++;
			continue;
		}
		if (bins.has(areaRatioBin(ar))) out.covered++;
		else out.outside++;
		if (predictTe(model.coefficients, ar) < model.floor) out.belowFloor++;
	}
	return out;
}
