/**
 * Share of apertures that pass against foil thickness, and the recommended (thickest passing)
 * foil, for the thickness chart.
 */
import type { ApertureInput } from './aperture';
import { apertureGeometry, type ApertureGeometry } from './geometry';
import { validApertureCentreUm } from './outline';
import { checkStepRegions, thicknessAt, type StepRegion } from './step-regions';
import { areaRatio, aspectRatio } from './area-ratio';
import { meetsLimit } from './evaluate-aperture';
import { StencilInputError } from './stencil-input-error';
import type { PrintThresholds } from './thresholds';

/**
 * Usual foil thicknesses in µm (common practice, no source: 3 mil ≈ 75–80, 4 mil ≈ 100,
 * 5 mil = 127, 6 mil ≈ 150, 8 mil ≈ 200, plus metric 110/120/130/180 foils).
 */
export const COMMON_FOIL_THICKNESSES_UM: readonly number[] = Object.freeze([
	75, 80, 100, 110, 120, 127, 130, 150, 180, 200
]);

/** One point of the sweep chart. `passShare` is null when there are no apertures. */
export interface ThicknessSweepPoint {
	thicknessUm: number;
	passing: number;
	total: number;
	passShare: number | null;
}

/** Options of `thicknessSweep`. */
export interface ThicknessSweepOptions {
	thresholds: PrintThresholds;
	/**
	 * The stencil's step regions. Apertures inside one keep that region's own thickness at every
	 * point of the sweep; only the base foil is swept. Default none (a uniform foil).
	 */
	stepRegions?: readonly StepRegion[];
	/** Foils to try, µm; default `COMMON_FOIL_THICKNESSES_UM`. Sorted ascending in the output. */
	thicknessesUm?: readonly number[];
	/** Share of apertures that must pass for a foil to be recommended, 0–1; default 1 (all). */
	requiredPassShare?: number;
	/**
	 * Geometry of each aperture as `evaluateStencil` computed it (same order), so a read
	 * computes it once; when left out each aperture is checked and computed here.
	 */
	geometries?: readonly ApertureGeometry[];
}

/** Sweep result: the chart series and the recommendation. */
export interface ThicknessSweep {
	series: ThicknessSweepPoint[];
	requiredPassShare: number;
	/** Thickest foil in the list whose pass share ≥ required; null when none qualifies. */
	recommendedThicknessUm: number | null;
	/** Apertures inside a step region, which keep their local thickness across the sweep. */
	steppedApertures: number;
}

/**
 * Pass share at each candidate base-foil thickness. The question answered is "which base foil
 * suits this design, given its steps": the step regions are part of the design (each is drawn for
 * particular components and ordered at its own thickness), so apertures inside a region keep the
 * region's thickness (the same rule as `localThickness`: centre inside, last region wins) while
 * every other aperture takes the swept base thickness. Without step regions it is the plain
 * uniform-foil sweep. At the stencil's own base thickness the pass count equals that of
 * `evaluateStencil`. A stepped aperture that fails at its region's thickness fails at every base
 * foil, so no foil is recommended until the step is changed. O(n × thicknesses).
 * @throws {StencilInputError} for an invalid aperture, step region, thickness or share.
 * @example thicknessSweep(apertures, { thresholds: IPC_7525_THRESHOLDS, stepRegions }).recommendedThicknessUm // e.g. 120
 */
export function thicknessSweep(
	apertures: readonly ApertureInput[],
	options: ThicknessSweepOptions
): ThicknessSweep {
	const share = options.requiredPassShare ?? 1;
	const list = [...(options.thicknessesUm ?? COMMON_FOIL_THICKNESSES_UM)];
	const problems = list
		.map((t, i) => ({ t, i }))
		.filter(({ t }) => !Number.isFinite(t) || t <= 0)
		.map(({ t, i }) => ({
			where: 'thickness sweep',
			field: `thicknessesUm[${i}]`,
			message: `must be a finite number greater than 0 (got ${t})`
		}));
	if (!Number.isFinite(share) || share < 0 || share > 1)
		problems.push({
			where: 'thickness sweep',
			field: 'requiredPassShare',
			message: `must be between 0 and 1 (got ${share})`
		});
	const regions = options.stepRegions ?? [];
	problems.push(...checkStepRegions(regions));
	if (problems.length > 0) throw new StencilInputError(problems);
	if (options.geometries && options.geometries.length !== apertures.length)
		throw new StencilInputError([
			{
				where: 'thickness sweep',
				field: 'geometries',
				message: `must have one entry per aperture (${apertures.length}, got ${options.geometries.length})`
			}
		]);
	const geometries = options.geometries ?? apertures.map((a, i) => apertureGeometry(a, i));
	const { minAreaRatio, minAspectRatio } = options.thresholds;
	const passesAt = (g: ApertureGeometry, thicknessUm: number) =>
		meetsLimit(areaRatio(g.areaUm2, g.perimeterUm, thicknessUm), minAreaRatio) &&
		meetsLimit(aspectRatio(g.minDimensionUm, thicknessUm), minAspectRatio);
	// Stepped apertures do not change with the base foil: judge them once.
	const swept: ApertureGeometry[] = [];
	let steppedApertures = 0;
	let steppedPassing = 0;
	geometries.forEach((g, i) => {
		// NaN as the base thickness marks "in no step region".
		const regionThicknessUm = thicknessAt(validApertureCentreUm(apertures[i]), NaN, regions);
		if (Number.isNaN(regionThicknessUm)) swept.push(g);
		else {
			steppedApertures++;
			if (passesAt(g, regionThicknessUm)) steppedPassing++;
		}
	});
	const series = [...new Set(list)]
		.sort((a, b) => a - b)
		.map((thicknessUm) => {
			let passing = steppedPassing;
			for (const g of swept) if (passesAt(g, thicknessUm)) passing++;
			const total = geometries.length;
			return { thicknessUm, passing, total, passShare: total === 0 ? null : passing / total };
		});
	let recommended: number | null = null;
	for (const p of series)
		if (p.passShare !== null && p.passShare + 1e-12 >= share) recommended = p.thicknessUm;
	return {
		series,
		requiredPassShare: share,
		recommendedThicknessUm: recommended,
		steppedApertures
	};
}
