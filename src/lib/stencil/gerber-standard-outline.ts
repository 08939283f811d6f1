/**
 * Outline of a standard Gerber aperture (C, R, O, P), computed from its `%ADD...*%` parameters
 * so the result is exact: a circle stays a circle, a rectangle a rectangle, an obround a
 * rounded rectangle with radius half its smaller side.
 */
import type { GerberOutlineResult, GerberPoint, GerberToolDefinition } from './gerber-types';

function positive(value: unknown, what: string): number {
	if (typeof value !== 'number' || !Number.isFinite(value) || value < 0) {
		throw new RangeError(`${what} must be a number ≥ 0 (got ${String(value)})`);
	}
	return value;
}

/**
 * Vertices of a regular polygon with circumscribed diameter `diameter` and `count` vertices,
 * the first on the +x axis, before rotation, counter-clockwise (Gerber standard aperture P).
 * @example regularPolygonVertices(2, 4) // [[1, 0], [0, 1], [-1, 0], [0, -1]] (to rounding)
 */
export function regularPolygonVertices(diameter: number, count: number): GerberPoint[] {
	const r = diameter / 2;
	const vertices: GerberPoint[] = [];
	for (let k = 0; k < count; k++) {
		const angle = (2 * Math.PI * k) / count;
		vertices.push([r * Math.cos(angle), r * Math.sin(angle)]);
	}
	return vertices;
}

/**
 * Outline of a standard aperture relative to its flash point, in file units, or the reason it
 * is skipped (a hole, or zero size). Used by the Gerber importer for each flashed D-code.
 * Reference: Gerber Layer Format Specification (Ucamco), "Standard aperture templates":
 * C diameter; R x-size, y-size; O x-size, y-size; P outer diameter, vertices 3–12, rotation.
 * @throws {RangeError} when a size is negative or not a number, or P has a bad vertex count.
 * @example standardApertureOutline({ shape: 'obround', params: [2, 1], hole: [] })
 * // { outline: { kind: 'rectangle', length: 2, width: 1, cornerRadius: 0.5, cx: 0, cy: 0, rotationDeg: 0 } }
 */
export function standardApertureOutline(tool: GerberToolDefinition): GerberOutlineResult {
	const p = tool.params;
	let result: GerberOutlineResult;
	if (tool.shape === 'circle') {
		const d = positive(p[0], 'circle diameter');
		result = { outline: { kind: 'circle', diameter: d, cx: 0, cy: 0 } };
	} else if (tool.shape === 'rect' || tool.shape === 'obround') {
		const x = positive(p[0], 'x size');
		const y = positive(p[1], 'y size');
		const obround = tool.shape === 'obround';
		// An obround with equal sides is a circle; give it the simpler exact shape.
		result =
			obround && x === y
				? { outline: { kind: 'circle', diameter: x, cx: 0, cy: 0 } }
				: {
						outline: {
							kind: 'rectangle',
							length: x,
							width: y,
							cornerRadius: obround ? Math.min(x, y) / 2 : 0,
							cx: 0,
							cy: 0,
							rotationDeg: 0
						}
					};
	} else if (tool.shape === 'poly') {
		const d = positive(p[0], 'polygon diameter');
		const n = p[1];
		if (!Number.isInteger(n) || n < 3 || n > 12) {
			throw new RangeError(`polygon vertex count must be an integer from 3 to 12 (got ${n})`);
		}
		const rot = p[2] ?? 0;
		if (!Number.isFinite(rot)) {
			throw new RangeError(`polygon rotation must be a number (got ${rot})`);
		}
		const vertices = regularPolygonVertices(d, n);
		result = { outline: { kind: 'polygon', vertices, cx: 0, cy: 0, rotationDeg: rot } };
	} else {
		throw new RangeError(`"${tool.shape}" is not a standard aperture (C, R, O or P)`);
	}
	if (tool.hole.length > 0) {
		return { skipReason: 'has a hole; a paste aperture with a hole cannot be represented' };
	}
	const o = result.outline;
	const zero =
		o.kind === 'circle'
			? o.diameter === 0
			: o.kind === 'rectangle'
				? o.length * o.width === 0
				: p[0] === 0;
	return zero ? { skipReason: 'has zero size' } : result;
}
