import type { Db } from '../db';
import {
	COMMON_FOIL_THICKNESSES_UM,
	evaluateStencil,
	suggestPowderType,
	summarizeStencil,
	thicknessSweep,
	type PowderSuggestion,
	type PrintThresholds,
	type StencilSummary,
	type ThicknessSweep,
	type ThresholdFailure
} from '$lib/stencil';
import { findApertureOverlaps } from '$lib/stencil/overlaps';
import { loadApertures, type StoredAperture } from './apertures';
import { getStencil, type StencilRecord } from './stencils';
import { siteThresholds } from './thresholds';

/** One aperture with its figures, as `GET /api/stencils/{id}/apertures` answers (unrounded). */
export type EvaluatedAperture = StoredAperture & {
	thicknessUm: number;
	areaUm2: number;
	perimeterUm: number;
	minDimensionUm: number;
	areaRatio: number;
	aspectRatio: number;
	volumeUm3: number;
	maxPassingThicknessUm: number;
	status: 'pass' | 'fail';
	reasons: ThresholdFailure[];
};

/** A stencil with everything the design check shows. */
export interface StencilCheck {
	stencil: StencilRecord;
	thresholds: PrintThresholds;
	apertures: EvaluatedAperture[];
	summary: StencilSummary;
}

/**
 * Load a stencil and evaluate every aperture against the site thresholds for its technology,
 * with step regions applied (evaluated on read, so a threshold change shows at once).
 * @throws StencilNotFoundError.
 */
export function checkStoredStencil(db: Db, stencilId: number): StencilCheck {
	const stencil = getStencil(db, stencilId);
	const thresholds = siteThresholds(db)[stencil.technology];
	return evaluateStoredApertures(stencil, thresholds, loadApertures(db, stencilId));
}

/** `checkStoredStencil` on a stencil, thresholds and apertures already read. */
export function evaluateStoredApertures(
	stencil: StencilRecord,
	thresholds: PrintThresholds,
	stored: StoredAperture[]
): StencilCheck {
	const results = evaluateStencil(stored, {
		thicknessUm: stencil.thicknessUm,
		thresholds,
		stepRegions: stencil.stepRegions,
		// Every stored outline passed the crossing test on import (`importApertures`).
		outlineCrossing: false
	});
	const evaluated = stored.map((a, i) => {
		const e = results[i];
		return Object.assign(a, {
			thicknessUm: e.thicknessUm,
			areaUm2: e.areaUm2,
			perimeterUm: e.perimeterUm,
			minDimensionUm: e.minDimensionUm,
			areaRatio: e.areaRatio,
			aspectRatio: e.aspectRatio,
			volumeUm3: e.volumeUm3,
			maxPassingThicknessUm: e.maxPassingThicknessUm,
			status: e.status,
			reasons: e.reasons
		});
	});
	return { stencil, thresholds, apertures: evaluated, summary: summarizeStencil(results) };
}

/** One overlapping pair, by row id and label. */
export interface OverlapPair {
	a: { id: number; refdes: string; pad: string };
	b: { id: number; refdes: string; pad: string };
	areaUm2: number;
}

/** Openings that overlap, and the paste area summed and as a union (shared parts once). */
export interface StencilOverlaps {
	sumAreaUm2: number;
	unionAreaUm2: number;
	pairCount: number;
	/** The first `MAX_LISTED_OVERLAPS` pairs. */
	pairs: OverlapPair[];
	complete: boolean;
	note?: string;
}

/** Pairs listed on the page and in the API; the count is always complete. */
export const MAX_LISTED_OVERLAPS = 200;

/** The stencil-wide advice: thickness sweep, powder type and overlapping openings. */
export interface StencilAdvice {
	sweep: ThicknessSweep;
	powder: PowderSuggestion;
	overlaps: StencilOverlaps;
}

/** Overlapping openings of an evaluated stencil (grid of boxes, then exact intersections). */
export function stencilOverlaps(check: StencilCheck): StencilOverlaps {
	const list = check.apertures;
	const report = findApertureOverlaps(
		list,
		list.map((a) => a.areaUm2)
	);
	const ref = (i: number) => ({ id: list[i].id, refdes: list[i].refdes, pad: list[i].pad });
	return {
		sumAreaUm2: report.sumAreaUm2,
		unionAreaUm2: report.unionAreaUm2,
		pairCount: report.pairs.length,
		pairs: report.pairs
			.slice(0, MAX_LISTED_OVERLAPS)
			.map((p) => ({ a: ref(p.a), b: ref(p.b), areaUm2: p.areaUm2 })),
		complete: report.complete,
		...(report.note ? { note: report.note } : {})
	};
}

/**
 * Thickness sweep of the base foil over the common foils (with the stencil's own thickness added;
 * apertures in step regions keep their region's thickness) and the coarsest J-STD-005 powder type
 * that fits the narrowest opening (five-ball rule, common practice).
 */
export function stencilAdvice(check: StencilCheck): StencilAdvice {
	const thicknessesUm = [...COMMON_FOIL_THICKNESSES_UM, check.stencil.thicknessUm];
	return {
		// The geometry evaluated in `checkStoredStencil` is reused: computed once per read.
		sweep: thicknessSweep(check.apertures, {
			thresholds: check.thresholds,
			thicknessesUm,
			stepRegions: check.stencil.stepRegions,
			geometries: check.apertures
		}),
		powder: suggestPowderType(
			check.apertures,
			undefined,
			check.apertures.map((a) => a.minDimensionUm)
		),
		overlaps: stencilOverlaps(check)
	};
}
