/**
 * Stencil-level summary of aperture evaluations for the stencil page header.
 */
import type { StencilApertureResult } from './evaluate-stencil';

/** An extreme value and the aperture it belongs to. */
export interface ApertureExtreme {
	value: number;
	index: number;
	refdes: string;
	pad: string;
}

/** Summary of a stencil check. Extremes are null when there are no apertures. */
export interface StencilSummary {
	total: number;
	passCount: number;
	failCount: number;
	/** Apertures failing the area-ratio limit (an aperture may fail both limits). */
	failAreaRatioCount: number;
	failAspectRatioCount: number;
	worstAreaRatio: ApertureExtreme | null;
	worstAspectRatio: ApertureExtreme | null;
	/** Smallest narrowest-opening on the stencil, µm. */
	smallestOpening: ApertureExtreme | null;
	/** min over apertures of the thickest passing foil: the foil at which all would pass, µm. */
	maxPassingThicknessUm: ApertureExtreme | null;
	totalAreaUm2: number;
	totalVolumeUm3: number;
	/** Distinct foil thicknesses used (more than one on a step stencil), ascending. */
	thicknessesUm: number[];
}

function pickMin(
	results: readonly StencilApertureResult[],
	get: (r: StencilApertureResult) => number
): ApertureExtreme | null {
	let best: StencilApertureResult | null = null;
	for (const r of results) if (best === null || get(r) < get(best)) best = r;
	return best && { value: get(best), index: best.index, refdes: best.refdes, pad: best.pad };
}

/**
 * Summarise evaluated apertures: pass/fail counts, worst ratios with their apertures, totals.
 * Ties keep the first aperture in list order.
 * @example summarizeStencil(evaluateStencil(apertures, settings)).worstAreaRatio // { value: 0.48, refdes: 'C3', pad: '1', index: 7 }
 */
export function summarizeStencil(results: readonly StencilApertureResult[]): StencilSummary {
	let passCount = 0;
	let failAreaRatioCount = 0;
	let failAspectRatioCount = 0;
	let totalAreaUm2 = 0;
	let totalVolumeUm3 = 0;
	const thicknesses = new Set<number>();
	for (const r of results) {
		if (r.status === 'pass') passCount++;
		if (r.reasons.some((x) => x.limit === 'areaRatio')) failAreaRatioCount++;
		if (r.reasons.some((x) => x.limit === 'aspectRatio')) failAspectRatioCount++;
		totalAreaUm2 += r.areaUm2;
		totalVolumeUm3 += r.volumeUm3;
		thicknesses.add(r.thicknessUm);
	}
	return {
		total: results.length,
		passCount,
		failCount: results.length - passCount,
		failAreaRatioCount,
		failAspectRatioCount,
		worstAreaRatio: pickMin(results, (r) => r.areaRatio),
		worstAspectRatio: pickMin(results, (r) => r.aspectRatio),
		smallestOpening: pickMin(results, (r) => r.minDimensionUm),
		maxPassingThicknessUm: pickMin(results, (r) => r.maxPassingThicknessUm),
		totalAreaUm2,
		totalVolumeUm3,
		thicknessesUm: [...thicknesses].sort((a, b) => a - b)
	};
}
