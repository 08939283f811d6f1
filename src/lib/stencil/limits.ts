import { Refusal } from '../errors';

/**
 * Work budgets of the stencil parsers and computations, in one place. Every input that can make
 * work grow (Gerber step-and-repeat, macros, regions, arcs, polygon outlines, CSV rows) is
 * counted against these before the work is done, and refused with a message naming the limit
 * and the line. The server reads overrides from the environment (`stencilLimitsFromEnv` in
 * `$lib/server/stencils/limits-env.ts`) and passes them down; pure code only takes them as
 * arguments, with these defaults.
 */

/** The budgets; all counts. */
export interface StencilLimits {
	/** Openings one Gerber layer may produce, step-and-repeat copies included. */
	maxOpeningsPerLayer: number;
	/** Apertures one stencil may hold (and so one import may bring). */
	maxAperturesPerStencil: number;
	/** Vertices of one polygon outline (region contour, macro outline, CSV/JSON polygon). */
	maxOutlineVertices: number;
	/** Polygon vertices one import (file or request) may bring, all apertures together. */
	maxVerticesPerImport: number;
	/** Polygon vertices one stencil may hold, all apertures together (keeps reads cheap). */
	maxVerticesPerStencil: number;
	/** Primitives (and variable definitions) of one Gerber aperture macro. */
	maxMacroPrimitives: number;
	/** Primitives of all distinct flashed macro shapes of one Gerber layer (each costs a hull). */
	maxMacroPrimitivesPerLayer: number;
	/** Macro definitions plus aperture definitions in one Gerber file. */
	maxApertureDefinitions: number;
	/** Segments (lines and arcs) of one Gerber region, before arcs are cut into chords. */
	maxRegionSegments: number;
	/**
	 * Stroke segments of one Gerber layer's draws (D01 outside regions, arcs cut into chords,
	 * step-and-repeat copies included): each becomes a polygon united with its neighbours.
	 */
	maxDrawSegmentsPerLayer: number;
	/** Characters of one Gerber command word (between two `*`), so no line can be endless. */
	maxGerberWordChars: number;
	/** Parser thread: wall-clock deadline for one upload, ms. */
	parseDeadlineMs: number;
	/** Parser thread: heap ceiling, MB (V8 old generation). */
	parseHeapMb: number;
}

/**
 * Defaults. A real paste layer of a dense board has 10,000–30,000 openings, and a stencil holds
 * at most 50,000 apertures, so a layer making more could never be stored. Outlines of real pads
 * have tens of vertices; the 1,000 of a smooth arc-cut pad is far above them. Polygon vertices
 * per import and per stencil are what make reads cost: 500,000 keep a stencil read under a
 * second (`npm run bench:stencil`).
 */
export const DEFAULT_STENCIL_LIMITS: Readonly<StencilLimits> = Object.freeze({
	maxOpeningsPerLayer: 50_000,
	maxAperturesPerStencil: 50_000,
	maxOutlineVertices: 1_000,
	maxVerticesPerImport: 500_000,
	maxVerticesPerStencil: 500_000,
	maxMacroPrimitives: 100,
	maxMacroPrimitivesPerLayer: 20_000,
	maxApertureDefinitions: 10_000,
	maxRegionSegments: 100_000,
	maxDrawSegmentsPerLayer: 20_000,
	maxGerberWordChars: 65_536,
	parseDeadlineMs: 30_000,
	parseHeapMb: 512
});

/** Physical ranges of parsed numbers (µm and degrees): outside them a value is an error. */
export const NUMBER_RANGES = Object.freeze({
	/** Smallest aperture size, 1 µm: below any opening a foil can be cut with. */
	minApertureSizeUm: 1,
	/** Largest aperture size, 100 mm. */
	maxApertureSizeUm: 100_000,
	/** Largest |x| or |y| of a position, 2 m: beyond any stencil frame. */
	maxPositionUm: 2_000_000,
	/** Largest |rotation|, one turn either way. */
	maxRotationDeg: 360
});

/**
 * Relative tolerance of geometric comparisons made after a unit conversion (inch → µm), so a
 * corner radius of 121.6 µm against a half side of 121.59995 µm is the same length.
 */
export const RELATIVE_TOLERANCE = 1e-6;

/**
 * Format a count with thousands separators for messages (`100,000,000`).
 * @example formatCount(100000000) // '100,000,000'
 */
export function formatCount(n: number): string {
	if (!Number.isFinite(n)) return String(n);
	return Math.round(n)
		.toString()
		.replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}

/**
 * Merge overrides into the defaults; an override that is not a positive safe integer is ignored.
 * @example withLimits({ maxOutlineVertices: 2000 }).maxOutlineVertices // 2000
 */
export function withLimits(overrides: Partial<StencilLimits> = {}): StencilLimits {
	const out: StencilLimits = { ...DEFAULT_STENCIL_LIMITS };
	for (const key of Object.keys(out) as (keyof StencilLimits)[]) {
		const v = overrides[key];
		if (typeof v === 'number' && Number.isSafeInteger(v) && v > 0) out[key] = v;
	}
	return out;
}

/** Thrown by a computation that would exceed a budget; `status` 413 or 422 for the answer. */
export class StencilBudgetError extends Refusal {
	constructor(
		message: string,
		readonly status: 413 | 422 = 422
	) {
		super(message);
		this.name = 'StencilBudgetError';
	}
}
