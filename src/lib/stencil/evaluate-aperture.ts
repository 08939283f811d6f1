/**
 * Pass/fail evaluation of one aperture at one foil thickness against area- and aspect-ratio
 * minimums, with the reasons and the thickest foil at which it would pass.
 */
import type { ApertureInput } from './aperture';
import { apertureGeometry, type ApertureGeometry } from './geometry';
import { areaRatio, aspectRatio } from './area-ratio';
import type { PrintThresholds } from './thresholds';
import { StencilInputError } from './stencil-input-error';

/**
 * Slack for floating-point rounding when comparing with a limit: an aperture computed exactly
 * on the limit (e.g. AR 0.66 coming out as 0.6599999999999999) passes.
 */
export const RATIO_COMPARISON_SLACK = 1e-9;

/** Why an aperture fails one limit. `shortBy` = required − actual (> 0). */
export interface ThresholdFailure {
	limit: 'areaRatio' | 'aspectRatio';
	required: number;
	actual: number;
	shortBy: number;
	message: string;
}

/** Result of `evaluateAperture`; all numbers unrounded. */
export interface ApertureEvaluation {
	thicknessUm: number;
	areaUm2: number;
	perimeterUm: number;
	minDimensionUm: number;
	areaRatio: number;
	aspectRatio: number;
	/** Theoretical deposit volume A × T in µm³. */
	volumeUm3: number;
	status: 'pass' | 'fail';
	reasons: ThresholdFailure[];
	/** Thickest foil (µm) at which both limits are met: min(A/(P·ARmin), Dmin/aspectMin). */
	maxPassingThicknessUm: number;
}

/** True when `actual` meets `required` (inclusive, with rounding slack). */
export function meetsLimit(actual: number, required: number): boolean {
	return actual + RATIO_COMPARISON_SLACK >= required;
}

/**
 * Throw when a threshold is not a finite number > 0.
 * @throws {StencilInputError} naming each bad field.
 * @example checkThresholds({ minAreaRatio: 0.66, minAspectRatio: 1.5 }) // no error
 */
export function checkThresholds(thresholds: PrintThresholds): void {
	const bad = (['minAreaRatio', 'minAspectRatio'] as const).filter(
		(k) => !Number.isFinite(thresholds[k]) || thresholds[k] <= 0
	);
	if (bad.length > 0)
		throw new StencilInputError(
			bad.map((field) => ({
				where: 'thresholds',
				field,
				message: `must be a finite number greater than 0 (got ${thresholds[field]})`
			}))
		);
}

/**
 * Evaluate precomputed geometry (lets sweeps reuse one geometry for many thicknesses).
 * @throws {StencilInputError} for a thickness or threshold that is not finite and > 0.
 * @example evaluateGeometry({ areaUm2: 200000, perimeterUm: 2400, minDimensionUm: 200 }, 150, IPC_7525_THRESHOLDS).status // 'fail'
 */
export function evaluateGeometry(
	geometry: ApertureGeometry,
	thicknessUm: number,
	thresholds: PrintThresholds
): ApertureEvaluation {
	checkThresholds(thresholds);
	// Validate the numbers once here; the fast path below does no checks.
	areaRatio(geometry.areaUm2, geometry.perimeterUm, thicknessUm);
	aspectRatio(geometry.minDimensionUm, thicknessUm);
	return evaluateValidGeometry(geometry, thicknessUm, thresholds);
}

/**
 * `evaluateGeometry` without argument checks, for loops over already validated stencils.
 * @example evaluateValidGeometry({ areaUm2: 200000, perimeterUm: 2400, minDimensionUm: 200 }, 100, IPC_7525_THRESHOLDS).areaRatio // 0.8333…
 */
export function evaluateValidGeometry(
	geometry: ApertureGeometry,
	thicknessUm: number,
	thresholds: PrintThresholds
): ApertureEvaluation {
	const ar = geometry.areaUm2 / (geometry.perimeterUm * thicknessUm);
	const asp = geometry.minDimensionUm / thicknessUm;
	const reasons: ThresholdFailure[] = [];
	if (!meetsLimit(ar, thresholds.minAreaRatio))
		reasons.push({
			limit: 'areaRatio',
			required: thresholds.minAreaRatio,
			actual: ar,
			shortBy: thresholds.minAreaRatio - ar,
			message:
				`area ratio ${ar.toFixed(3)} is below the minimum ${thresholds.minAreaRatio} ` +
				`at ${thicknessUm} µm`
		});
	if (!meetsLimit(asp, thresholds.minAspectRatio))
		reasons.push({
			limit: 'aspectRatio',
			required: thresholds.minAspectRatio,
			actual: asp,
			shortBy: thresholds.minAspectRatio - asp,
			message:
				`aspect ratio ${asp.toFixed(3)} is below the minimum ${thresholds.minAspectRatio} ` +
				`at ${thicknessUm} µm`
		});
	return {
		thicknessUm,
		areaUm2: geometry.areaUm2,
		perimeterUm: geometry.perimeterUm,
		minDimensionUm: geometry.minDimensionUm,
		areaRatio: ar,
		aspectRatio: asp,
		volumeUm3: geometry.areaUm2 * thicknessUm,
		status: reasons.length === 0 ? 'pass' : 'fail',
		reasons,
		maxPassingThicknessUm: Math.min(
			geometry.areaUm2 / (geometry.perimeterUm * thresholds.minAreaRatio),
			geometry.minDimensionUm / thresholds.minAspectRatio
		)
	};
}

/**
 * Evaluate one aperture at a foil thickness: area ratio, aspect ratio, volume, pass/fail with
 * reasons, and the thickest passing foil. Used for the aperture table and the stencil check.
 * @throws {StencilInputError} for an invalid aperture, thickness or thresholds.
 * @example evaluateAperture({ refdes: 'U1', pad: '1', shape: 'rectangle', lengthUm: 1000, widthUm: 200, xUm: 0, yUm: 0, rotationDeg: 0 }, 100, { minAreaRatio: 0.66, minAspectRatio: 1.5 })
 * // { areaRatio: 0.8333…, aspectRatio: 2, status: 'pass', maxPassingThicknessUm: 126.26…, … }
 */
export function evaluateAperture(
	aperture: ApertureInput,
	thicknessUm: number,
	thresholds: PrintThresholds
): ApertureEvaluation {
	return evaluateGeometry(apertureGeometry(aperture), thicknessUm, thresholds);
}
