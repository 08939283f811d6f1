/**
 * Conversion of an importer outline (file units, relative to a flash point) into an
 * `ApertureInput` in µm, and the bounding boxes used to relate clear-polarity objects to the
 * apertures they would cut.
 */
import type { ApertureInput, PointUm } from './aperture';
import type { GerberOutline, GerberPoint } from './gerber-types';

/** Round to 1e-4 µm: far below any Gerber resolution (1 nm in FS 2.6 mm), removes float noise. */
function roundUm(value: number): number {
	const r = Math.round(value * 1e4) / 1e4;
	return r === 0 ? 0 : r;
}

/** A rotation folded into (-360°, 360°), the stored range; the same turn. */
function foldDeg(deg: number): number {
	const r = deg % 360;
	return r === 0 ? 0 : r;
}

/**
 * The aperture for `outline` flashed at (x, y), scaled by `micrometresPerUnit` (1000 for mm,
 * 25 400 for inches); refdes and pad are left empty for `nameGerberApertures`.
 * A rectangle with a corner radius becomes a `rounded-rectangle`.
 * @example gerberOutlineToAperture({ kind: 'circle', diameter: 0.5, cx: 0, cy: 0 }, 1, 2, 1000)
 * // { refdes: '', pad: '', xUm: 1000, yUm: 2000, shape: 'circle', diameterUm: 500, rotationDeg: 0 }
 */
export function gerberOutlineToAperture(
	outline: GerberOutline,
	x: number,
	y: number,
	micrometresPerUnit: number
): ApertureInput {
	const f = micrometresPerUnit;
	const base = {
		refdes: '',
		pad: '',
		xUm: roundUm((x + outline.cx) * f),
		yUm: roundUm((y + outline.cy) * f)
	};
	if (outline.kind === 'circle') {
		return { ...base, shape: 'circle', diameterUm: roundUm(outline.diameter * f), rotationDeg: 0 };
	}
	if (outline.kind === 'rectangle') {
		const rounded = outline.cornerRadius > 0;
		return {
			...base,
			shape: rounded ? 'rounded-rectangle' : 'rectangle',
			lengthUm: roundUm(outline.length * f),
			widthUm: roundUm(outline.width * f),
			...(rounded ? { cornerRadiusUm: roundUm(outline.cornerRadius * f) } : {}),
			rotationDeg: foldDeg(outline.rotationDeg)
		};
	}
	return {
		...base,
		shape: 'polygon',
		verticesUm: outline.vertices.map((v) => [roundUm(v[0] * f), roundUm(v[1] * f)] as PointUm),
		rotationDeg: foldDeg(outline.rotationDeg)
	};
}

/**
 * Bounding box [xmin, ymin, xmax, ymax] of `outline` flashed at (x, y), in file units.
 * @example gerberOutlineBox({ kind: 'circle', diameter: 2, cx: 0, cy: 0 }, 5, 5) // [4, 4, 6, 6]
 */
export function gerberOutlineBox(outline: GerberOutline, x: number, y: number): number[] {
	const cx = x + outline.cx;
	const cy = y + outline.cy;
	if (outline.kind === 'circle') {
		const r = outline.diameter / 2;
		return [cx - r, cy - r, cx + r, cy + r];
	}
	const hl = outline.kind === 'rectangle' ? outline.length / 2 : 0;
	const hw = outline.kind === 'rectangle' ? outline.width / 2 : 0;
	const local: GerberPoint[] =
		outline.kind === 'polygon'
			? outline.vertices
			: [
					[-hl, -hw],
					[hl, -hw],
					[hl, hw],
					[-hl, hw]
				];
	const a = (outline.rotationDeg * Math.PI) / 180;
	const cos = Math.cos(a);
	const sin = Math.sin(a);
	const xs = local.map(([u, v]) => cx + u * cos - v * sin);
	const ys = local.map(([u, v]) => cy + u * sin + v * cos);
	return [Math.min(...xs), Math.min(...ys), Math.max(...xs), Math.max(...ys)];
}

/**
 * Whether two bounding boxes overlap with positive area (touching edges do not count).
 * @example boxesOverlap([0, 0, 2, 2], [1, 1, 3, 3]) // true
 */
export function boxesOverlap(a: readonly number[], b: readonly number[]): boolean {
	return a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3];
}
