/**
 * Stencil aperture input type shared by the CSV importer, the Gerber importer and the JSON API.
 *
 * Coordinate conventions (all lengths in micrometres, µm):
 * - (xUm, yUm) is the aperture's reference point on the stencil: the centre of a rectangle,
 *   rounded rectangle or circle, and the origin of a polygon's vertex list.
 * - Axes follow Gerber/CAD convention: x to the right, y up.
 * - `lengthUm` is the extent along the aperture's own x axis and `widthUm` along its own y axis,
 *   both before rotation. Neither has to be the larger one.
 * - `rotationDeg` turns the aperture counter-clockwise about (xUm, yUm).
 * - Polygon `verticesUm` are relative to (xUm, yUm) before rotation, listed in order around the
 *   outline (either direction), without repeating the first vertex at the end.
 */

/** Aperture outline shapes. An obround is a rounded rectangle whose radius is half its width. */
export type ApertureShape = 'rectangle' | 'rounded-rectangle' | 'circle' | 'polygon';

/** All accepted shape names, for validation and select lists. */
export const APERTURE_SHAPES: readonly ApertureShape[] = [
	'rectangle',
	'rounded-rectangle',
	'circle',
	'polygon'
];

/** A point in micrometres, [x, y]. */
export type PointUm = [number, number];

/**
 * One stencil aperture as imported from CSV, Gerber or JSON.
 *
 * Which size fields are needed depends on `shape`:
 * - `rectangle`: `lengthUm`, `widthUm` (a `cornerRadiusUm` > 0 makes it a rounded rectangle,
 *   so JSON clients may send either spelling);
 * - `rounded-rectangle`: `lengthUm`, `widthUm`, `cornerRadiusUm` (0 ≤ r ≤ min(L, W)/2);
 * - `circle`: `diameterUm`;
 * - `polygon`: `verticesUm` (at least 3, simple, i.e. not self-intersecting).
 *
 * @example
 * const pad: ApertureInput = {
 * 	refdes: 'U1', pad: '1', shape: 'rectangle', lengthUm: 1000, widthUm: 200,
 * 	xUm: 12500, yUm: 4000, rotationDeg: 90
 * };
 */
export interface ApertureInput {
	/** Component reference designator, e.g. `U1`; may be empty for unassigned Gerber flashes. */
	refdes: string;
	/** Pad name or number within the component, e.g. `1` or `A3`. */
	pad: string;
	shape: ApertureShape;
	lengthUm?: number;
	widthUm?: number;
	cornerRadiusUm?: number;
	diameterUm?: number;
	verticesUm?: PointUm[];
	xUm: number;
	yUm: number;
	rotationDeg: number;
	/**
	 * True when the opening was painted with draws (D01 strokes) on a Gerber layer and united
	 * into a polygon, rather than flashed or filled as a region; absent otherwise.
	 */
	drawn?: boolean;
}

/**
 * The shape used for computation: a `rectangle` with a corner radius > 0 is treated as a
 * `rounded-rectangle`, and a `rounded-rectangle` with radius 0 as a plain rectangle.
 * @example effectiveShape({ ...pad, shape: 'rectangle', cornerRadiusUm: 50 }) // 'rounded-rectangle'
 */
export function effectiveShape(aperture: ApertureInput): ApertureShape {
	if (aperture.shape === 'rectangle' || aperture.shape === 'rounded-rectangle') {
		const r = aperture.cornerRadiusUm ?? 0;
		return r > 0 ? 'rounded-rectangle' : 'rectangle';
	}
	return aperture.shape;
}

/**
 * A readable label for messages, e.g. `U1.3`, or `aperture #12` when refdes and pad are empty.
 * @example apertureLabel({ refdes: 'R5', pad: '2', ... }) // 'R5.2'
 */
export function apertureLabel(aperture: ApertureInput, index?: number): string {
	if (aperture.refdes || aperture.pad) return `${aperture.refdes}.${aperture.pad}`;
	return index === undefined ? 'aperture' : `aperture #${index + 1}`;
}
