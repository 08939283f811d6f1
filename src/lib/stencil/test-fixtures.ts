/**
 * Small aperture builders shared by the stencil unit tests (not used by app code).
 */
import type { ApertureInput, PointUm } from './aperture';

/**
 * A rectangle aperture at (x, y), unrotated unless given.
 * @example rect(1000, 200) // 1.0 × 0.2 mm at the origin
 */
export function rect(
	lengthUm: number,
	widthUm: number,
	extra: Partial<ApertureInput> = {}
): ApertureInput {
	return {
		refdes: 'U1',
		pad: '1',
		shape: 'rectangle',
		lengthUm,
		widthUm,
		xUm: 0,
		yUm: 0,
		rotationDeg: 0,
		...extra
	};
}

/**
 * A circle aperture.
 * @example circle(750)
 */
export function circle(diameterUm: number, extra: Partial<ApertureInput> = {}): ApertureInput {
	return {
		refdes: 'U1',
		pad: 'A1',
		shape: 'circle',
		diameterUm,
		xUm: 0,
		yUm: 0,
		rotationDeg: 0,
		...extra
	};
}

/**
 * A polygon aperture.
 * @example polygon([[0, 0], [100, 0], [0, 100]])
 */
export function polygon(verticesUm: PointUm[], extra: Partial<ApertureInput> = {}): ApertureInput {
	return {
		refdes: 'Q1',
		pad: '1',
		shape: 'polygon',
		verticesUm,
		xUm: 0,
		yUm: 0,
		rotationDeg: 0,
		...extra
	};
}
