/**
 * Evaluate every aperture of a stencil, with step-region thicknesses. O(n) in the number of
 * apertures (times the number of step regions, which is small).
 */
import type { ApertureInput } from './aperture';
import { checkAperture } from './aperture-validation';
import {
	checkThresholds,
	evaluateValidGeometry,
	type ApertureEvaluation
} from './evaluate-aperture';
import { validApertureGeometry } from './geometry';
import { validApertureCentreUm } from './outline';
import { checkStepRegions, thicknessAt, type StepRegion } from './step-regions';
import { StencilInputError, type InputProblem } from './stencil-input-error';
import type { PrintThresholds } from './thresholds';

/** At most this many problems are reported at once; the rest are counted. */
export const MAX_REPORTED_PROBLEMS = 100;

/** One aperture's evaluation, tagged with its list index and names. */
export interface StencilApertureResult extends ApertureEvaluation {
	index: number;
	refdes: string;
	pad: string;
}

/** Stencil-wide settings for `evaluateStencil`. */
export interface StencilSettings {
	/** Base foil thickness, µm. */
	thicknessUm: number;
	thresholds: PrintThresholds;
	stepRegions?: StepRegion[];
	/**
	 * Test polygon outlines for crossing edges (default true). Reads of stored stencils turn it
	 * off: every stored outline passed the full check when it was imported, and the test is the
	 * costliest part of a read of many-vertex outlines.
	 */
	outlineCrossing?: boolean;
}

/**
 * Evaluate all apertures of a stencil; each uses its local (step-region) thickness.
 * @throws {StencilInputError} listing up to 100 problems when any aperture, the thickness or a
 *   step region is invalid (all-or-nothing, so a report never silently skips apertures).
 * @example evaluateStencil(apertures, { thicknessUm: 120, thresholds: resolveThresholds('laser-stainless') })
 */
export function evaluateStencil(
	apertures: readonly ApertureInput[],
	settings: StencilSettings
): StencilApertureResult[] {
	const regions = settings.stepRegions ?? [];
	const problems: InputProblem[] = [];
	if (!Number.isFinite(settings.thicknessUm) || settings.thicknessUm <= 0)
		problems.push({
			where: 'stencil',
			field: 'thicknessUm',
			message: `must be a finite number greater than 0 (got ${settings.thicknessUm})`
		});
	problems.push(...checkStepRegions(regions));
	let extra = 0;
	const checkOptions = { outlineCrossing: settings.outlineCrossing ?? true };
	apertures.forEach((a, i) => {
		const p = checkAperture(a, i, undefined, checkOptions);
		if (problems.length + p.length <= MAX_REPORTED_PROBLEMS) problems.push(...p);
		else extra += p.length;
	});
	if (extra > 0)
		problems.push({ where: 'apertures', field: '*', message: `${extra} more problems not listed` });
	if (problems.length > 0) throw new StencilInputError(problems);
	checkThresholds(settings.thresholds);
	return apertures.map((a, index) => {
		const t = thicknessAt(validApertureCentreUm(a), settings.thicknessUm, regions);
		const e = evaluateValidGeometry(validApertureGeometry(a), t, settings.thresholds);
		// Fields copied one by one: a fixed-shape literal is much cheaper than a spread at 20k rows.
		return {
			index,
			refdes: a.refdes,
			pad: a.pad,
			thicknessUm: e.thicknessUm,
			areaUm2: e.areaUm2,
			perimeterUm: e.perimeterUm,
			minDimensionUm: e.minDimensionUm,
			areaRatio: e.areaRatio,
			aspectRatio: e.aspectRatio,
			volumeUm3: e.volumeUm3,
			status: e.status,
			reasons: e.reasons,
			maxPassingThicknessUm: e.maxPassingThicknessUm
		};
	});
}
