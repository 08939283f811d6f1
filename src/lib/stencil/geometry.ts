/**
 * Opening geometry of one aperture: area, perimeter (wall length) and smallest opening
 * dimension, the inputs of the area-ratio and aspect-ratio checks.
 */
import { effectiveShape, type ApertureInput } from './aperture';
import { checkAperture } from './aperture-validation';
import { StencilInputError } from './stencil-input-error';
import { openPolygon, polygonAreaUm2, polygonMinWidthUm, polygonPerimeterUm } from './polygon';

/** Area, perimeter and narrowest opening of an aperture, in µm² and µm. */
export interface ApertureGeometry {
	areaUm2: number;
	perimeterUm: number;
	/** Rectangle: min(L, W); circle: D; polygon: minimum caliper width of its convex hull. */
	minDimensionUm: number;
}

/**
 * Rounded-rectangle area, L·W − (4 − π)r²: each corner loses a r×r square and gains a quarter
 * disc πr²/4 (first principles). r = 0 is a rectangle, r = W/2 an obround.
 * @example roundedRectangleAreaUm2(1000, 200, 100) // 200000 - (4 - Math.PI) * 10000
 */
export function roundedRectangleAreaUm2(
	lengthUm: number,
	widthUm: number,
	radiusUm: number
): number {
	return lengthUm * widthUm - (4 - Math.PI) * radiusUm * radiusUm;
}

/**
 * Rounded-rectangle perimeter, 2(L + W) − (8 − 2π)r: each corner trades two straight runs of r
 * for a quarter arc πr/2 (first principles).
 * @example roundedRectanglePerimeterUm(300, 300, 150) // Math.PI * 300 (a circle)
 */
export function roundedRectanglePerimeterUm(
	lengthUm: number,
	widthUm: number,
	radiusUm: number
): number {
	return 2 * (lengthUm + widthUm) - (8 - 2 * Math.PI) * radiusUm;
}

/**
 * Compute the opening geometry of an aperture. Used by every check (area ratio, aspect ratio,
 * volume, powder size). A `rectangle` with `cornerRadiusUm` > 0 is computed as rounded.
 * @throws {StencilInputError} listing every problem when the aperture is invalid (see
 *   `checkAperture`).
 * @example apertureGeometry({ refdes: 'U1', pad: '1', shape: 'rectangle', lengthUm: 1000, widthUm: 200, xUm: 0, yUm: 0, rotationDeg: 0 })
 * // { areaUm2: 200000, perimeterUm: 2400, minDimensionUm: 200 }
 */
export function apertureGeometry(aperture: ApertureInput, index?: number): ApertureGeometry {
	const problems = checkAperture(aperture, index);
	if (problems.length > 0) throw new StencilInputError(problems);
	return validApertureGeometry(aperture);
}

/**
 * `apertureGeometry` without validation: the fast path for whole stencils whose apertures
 * have already passed `checkAperture`. Invalid input gives meaningless numbers, not an error.
 * @example validApertureGeometry(circle300).minDimensionUm // 300
 */
export function validApertureGeometry(aperture: ApertureInput): ApertureGeometry {
	switch (effectiveShape(aperture)) {
		case 'circle': {
			const d = aperture.diameterUm!;
			return { areaUm2: (Math.PI * d * d) / 4, perimeterUm: Math.PI * d, minDimensionUm: d };
		}
		case 'polygon': {
			const pts = openPolygon(aperture.verticesUm!);
			return {
				areaUm2: polygonAreaUm2(pts),
				perimeterUm: polygonPerimeterUm(pts),
				minDimensionUm: polygonMinWidthUm(pts)
			};
		}
		default: {
			const l = aperture.lengthUm!;
			const w = aperture.widthUm!;
			const r = aperture.cornerRadiusUm ?? 0;
			return {
				areaUm2: roundedRectangleAreaUm2(l, w, r),
				perimeterUm: roundedRectanglePerimeterUm(l, w, r),
				minDimensionUm: Math.min(l, w)
			};
		}
	}
}
