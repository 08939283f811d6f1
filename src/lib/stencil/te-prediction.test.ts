import { describe, expect, it } from 'vitest';
import {
	analyseTransferEfficiency,
	areaRatioBin,
	predictTe,
	seededRandom,
	TE_BUCKET_MAX,
	TE_BUCKET_WIDTH,
	type TeCurve,
	type TeHistogramRow
} from '$lib/analysis';
import { predictApertureTe, siteTeModel, teCoverage, type SiteTeModel } from './te-prediction';

const CURVE: TeCurve = { upper: 0.9, lower: 0.3, knee: 0.6, scale: 0.05 };
/** Bins 12–14: area ratios 0.60 to just under 0.75 (bins are 0.05 wide). */
const MODEL: SiteTeModel = {
	coefficients: CURVE,
	fittedBins: [12, 13, 14],
	areaRatioMin: 0.62,
	areaRatioMax: 0.73,
	pads: 1000,
	floor: 0.7,
	learnedMinAreaRatio: 0.63
};

describe('predicted TE of an aperture (logistic site model)', () => {
	it('is half-way between the plateaus at the knee and three quarters one scale·ln 3 above', () => {
		// Closed form: 1 / (1 + e^−z) is 1/2 at z = 0 and 3/4 at z = ln 3.
		expect(predictApertureTe(MODEL, 0.6).predictedTe).toBeCloseTo(0.6, 12);
		expect(predictApertureTe(MODEL, 0.6 + 0.05 * Math.log(3)).predictedTe).toBeCloseTo(
			0.3 + 0.75 * 0.6,
			12
		);
		expect(predictApertureTe(MODEL, 0.6 - 0.05 * Math.log(3)).predictedTe).toBeCloseTo(
			0.3 + 0.25 * 0.6,
			12
		);
	});

	it('is covered only inside a fitted 0.05-wide area-ratio bin', () => {
		// The same binning as the pads' (floor(AR / 0.05)); exact bin edges are left to rounding.
		expect(predictApertureTe(MODEL, 0.601).covered).toBe(true);
		expect(predictApertureTe(MODEL, 0.749).covered).toBe(true);
		expect(predictApertureTe(MODEL, 0.751).covered).toBe(false);
		expect(predictApertureTe(MODEL, 0.599).covered).toBe(false);
		expect(predictApertureTe(MODEL, 2).covered).toBe(false);
	});

	it('predicts nothing for an area ratio that is not a number', () => {
		expect(predictApertureTe(MODEL, NaN)).toEqual({ predictedTe: NaN, covered: false });
		expect(predictApertureTe(MODEL, Infinity).covered).toBe(false);
	});

	it('counts a stencil by coverage and by predicted TE below the floor', () => {
		// 0.62 and 0.70 inside the data; 0.40 and 1.20 outside. Below 0.70: 0.40 (≈0.31), 0.62
		// (≈0.66); 0.70 predicts ≈0.83 and 1.20 the plateau.
		expect(teCoverage(MODEL, [0.62, 0.7, 0.4, 1.2, NaN])).toEqual({
			covered: 2,
			outside: 3,
			belowFloor: 2
		});
		expect(predictTe(CURVE, 0.62)).toBeLessThan(0.7);
		expect(predictTe(CURVE, 0.7)).toBeGreaterThan(0.7);
	});
});

/** Pads of a known curve, binned the way the SQL scan bins them (area ratios 0.55–1.5 only). */
function syntheticRows(seed: number): TeHistogramRow[] {
	const rng = seededRandom(seed);
	const cells = new Map<string, TeHistogramRow>();
	for (let a = 0; a < 250; a++) {
		const ar = 0.55 + 0.95 * rng.uniform();
		for (let k = 0; k < 60; k++) {
			const te = Math.max(0, predictTe(CURVE, ar) + 0.05 * rng.normal());
			const bin = areaRatioBin(ar);
			const bucket = Math.min(TE_BUCKET_MAX, Math.floor(te / TE_BUCKET_WIDTH));
			const key = `${bin}:${bucket}`;
			const cell = cells.get(key) ?? { bin, bucket, count: 0, teSum: 0, areaRatioSum: 0 };
			cell.count++;
			cell.teSum += te;
			cell.areaRatioSum += ar;
			cells.set(key, cell);
		}
	}
	return [...cells.values()];
}

describe('the site model taken from one TE analysis', () => {
	it('predicts the known curve where the data lie and marks the rest outside', () => {
		const model = siteTeModel(analyseTransferEfficiency(syntheticRows(11), 0.7));
		expect(model).not.toBeNull();
		for (const ar of [0.6, 0.7, 1.0, 1.4]) {
			const p = predictApertureTe(model!, ar);
			expect(p.covered).toBe(true);
			expect(Math.abs(p.predictedTe - predictTe(CURVE, ar))).toBeLessThan(0.03);
		}
		// No pad printed below an area ratio of 0.55 or above 1.5: extrapolation, not covered.
		expect(predictApertureTe(model!, 0.45).covered).toBe(false);
		expect(predictApertureTe(model!, 1.8).covered).toBe(false);
	});

	it('is null when the analysis could not fit a curve', () => {
		expect(siteTeModel(analyseTransferEfficiency([], 0.7))).toBeNull();
	});
});
