/**
 * The two printability ratios of a stencil aperture and its theoretical deposit volume.
 * Reference: IPC-7525 Stencil Design Guidelines (area ratio = opening area / aperture wall
 * area; aspect ratio = narrowest opening / foil thickness).
 */
import { StencilInputError } from './stencil-input-error';

function requirePositive(value: number, field: string, where: string): void {
	if (!Number.isFinite(value) || value <= 0)
		throw new StencilInputError([
			{ where, field, message: `must be a finite number greater than 0 (got ${value})` }
		]);
}

/**
 * Area ratio = opening area / wall area = A / (P · T). Paste releases well when the opening
 * pulls harder on the paste than the walls do; IPC-7525 guides AR > 0.66.
 * @throws {StencilInputError} when an argument is not finite and > 0.
 * @example areaRatio(200_000, 2_400, 100) // 0.8333…
 */
export function areaRatio(areaUm2: number, perimeterUm: number, thicknessUm: number): number {
	requirePositive(areaUm2, 'areaUm2', 'areaRatio');
	requirePositive(perimeterUm, 'perimeterUm', 'areaRatio');
	requirePositive(thicknessUm, 'thicknessUm', 'areaRatio');
	return areaUm2 / (perimeterUm * thicknessUm);
}

/**
 * Aspect ratio = narrowest opening / foil thickness (IPC-7525 guides > 1.5).
 * @throws {StencilInputError} when an argument is not finite and > 0.
 * @example aspectRatio(200, 100) // 2
 */
export function aspectRatio(minDimensionUm: number, thicknessUm: number): number {
	requirePositive(minDimensionUm, 'minDimensionUm', 'aspectRatio');
	requirePositive(thicknessUm, 'thicknessUm', 'aspectRatio');
	return minDimensionUm / thicknessUm;
}

/**
 * Theoretical deposit volume = opening area × foil thickness (µm³): the denominator of
 * transfer efficiency (TE = measured volume / this).
 * @throws {StencilInputError} when an argument is not finite and > 0.
 * @example depositVolumeUm3(200_000, 100) // 20_000_000
 */
export function depositVolumeUm3(areaUm2: number, thicknessUm: number): number {
	requirePositive(areaUm2, 'areaUm2', 'depositVolumeUm3');
	requirePositive(thicknessUm, 'thicknessUm', 'depositVolumeUm3');
	return areaUm2 * thicknessUm;
}
