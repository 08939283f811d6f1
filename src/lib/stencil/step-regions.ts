/**
 * Step stencils: rectangular regions of the foil stepped to another thickness.
 */
import type { ApertureInput } from './aperture';
import { apertureCentreUm } from './outline';
import { StencilInputError, type InputProblem } from './stencil-input-error';

/** A stepped rectangle of the foil (µm, stencil coordinates) and its local thickness. */
export interface StepRegion {
	xMinUm: number;
	yMinUm: number;
	xMaxUm: number;
	yMaxUm: number;
	thicknessUm: number;
}

/**
 * List problems with step regions: non-finite numbers, min > max, thickness ≤ 0 or > 1 mm.
 * @example checkStepRegions([{ xMinUm: 0, yMinUm: 0, xMaxUm: -1, yMaxUm: 5, thicknessUm: 80 }])
 * // [{ where: 'stepRegions[0]', field: 'xMaxUm', message: 'must not be less than xMinUm (0)' }]
 */
export function checkStepRegions(regions: readonly StepRegion[]): InputProblem[] {
	const problems: InputProblem[] = [];
	regions.forEach((r, i) => {
		const where = `stepRegions[${i}]`;
		let finite = true;
		for (const field of ['xMinUm', 'yMinUm', 'xMaxUm', 'yMaxUm', 'thicknessUm'] as const) {
			if (typeof r[field] !== 'number' || !Number.isFinite(r[field])) {
				problems.push({
					where,
					field,
					message: `must be a finite number (got ${String(r[field])})`
				});
				finite = false;
			}
		}
		if (!finite) return;
		if (r.xMaxUm < r.xMinUm)
			problems.push({
				where,
				field: 'xMaxUm',
				message: `must not be less than xMinUm (${r.xMinUm})`
			});
		if (r.yMaxUm < r.yMinUm)
			problems.push({
				where,
				field: 'yMaxUm',
				message: `must not be less than yMinUm (${r.yMinUm})`
			});
		if (r.thicknessUm <= 0 || r.thicknessUm > 1000)
			problems.push({
				where,
				field: 'thicknessUm',
				message: `must be greater than 0 and at most 1000 µm (got ${r.thicknessUm})`
			});
	});
	return problems;
}

/**
 * Foil thickness at an aperture: the thickness of the step region containing the aperture's
 * centre (boundaries included), else the base thickness. When regions overlap, the last one in
 * the list wins, so list broad regions first and the pockets inside them after.
 * @throws {StencilInputError} for invalid regions, a bad base thickness or an invalid aperture.
 * @example localThickness(qfpPad, 120, [{ xMinUm: 0, yMinUm: 0, xMaxUm: 20000, yMaxUm: 20000, thicknessUm: 100 }]) // 100 if the pad centre is inside
 */
export function localThickness(
	aperture: ApertureInput,
	baseThicknessUm: number,
	stepRegions: readonly StepRegion[] = []
): number {
	if (!Number.isFinite(baseThicknessUm) || baseThicknessUm <= 0)
		throw new StencilInputError([
			{
				where: 'stencil',
				field: 'thicknessUm',
				message: `must be greater than 0 (got ${baseThicknessUm})`
			}
		]);
	const problems = checkStepRegions(stepRegions);
	if (problems.length > 0) throw new StencilInputError(problems);
	return thicknessAt(apertureCentreUm(aperture), baseThicknessUm, stepRegions);
}

/**
 * Thickness at a point (µm), same rule as `localThickness` but without validation: the fast
 * path for whole stencils after `checkStepRegions` has passed.
 * @example thicknessAt([5, 5], 120, [{ xMinUm: 0, yMinUm: 0, xMaxUm: 10, yMaxUm: 10, thicknessUm: 100 }]) // 100
 */
export function thicknessAt(
	[x, y]: [number, number],
	baseThicknessUm: number,
	stepRegions: readonly StepRegion[]
): number {
	let t = baseThicknessUm;
	for (const r of stepRegions)
		if (x >= r.xMinUm && x <= r.xMaxUm && y >= r.yMinUm && y <= r.yMaxUm) t = r.thicknessUm;
	return t;
}
