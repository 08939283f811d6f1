/**
 * Outline of a flashed Gerber macro aperture, from the primitives `gerber-plotter` evaluates
 * (circle 1, vector line 20, center line 21, outline 4, polygon 5 arrive as circle, rect and
 * poly primitives, already rotated). One primitive maps to one exact shape; several dark
 * primitives map to their convex hull when the hull is verified to be their union.
 */
import { convexHull } from './polygon';
import { arcSegmentCount } from './gerber-path';
import type {
	GerberOutline,
	GerberOutlineResult,
	GerberPadPrimitive,
	GerberPoint
} from './gerber-types';

type Drawable = Extract<GerberPadPrimitive, { type: 'circle' | 'rect' | 'poly' }>;

/** Samples per axis when checking that a convex hull is covered by the primitives. */
const COVERAGE_GRID = 48;

/** Relative tolerance for the right-angle and parallel-side tests of a rectangle. */
const RECTANGLE_TOLERANCE = 1e-9;

function round(value: number, step: number): number {
	return Math.round(value / step) * step;
}

/**
 * If four points form a rectangle (opposite sides equal and parallel, a right angle), return
 * its centre, side lengths and the direction of the first side in degrees, in (−90°, 90°].
 * Used to turn a rotated center-line or vector-line primitive back into an exact rectangle.
 * @example rectangleFromCorners([[0, 0], [2, 0], [2, 1], [0, 1]])
 * // { cx: 1, cy: 0.5, length: 2, width: 1, rotationDeg: 0 }
 */
export function rectangleFromCorners(
	points: readonly GerberPoint[]
): { cx: number; cy: number; length: number; width: number; rotationDeg: number } | null {
	if (points.length !== 4) return null;
	const [p0, p1, p2, p3] = points;
	const e0 = [p1[0] - p0[0], p1[1] - p0[1]];
	const e1 = [p2[0] - p1[0], p2[1] - p1[1]];
	const e2 = [p3[0] - p2[0], p3[1] - p2[1]];
	const e3 = [p0[0] - p3[0], p0[1] - p3[1]];
	const length = Math.hypot(e0[0], e0[1]);
	const width = Math.hypot(e1[0], e1[1]);
	if (length === 0 || width === 0) return null;
	const scale = Math.max(length, width);
	const tol = RECTANGLE_TOLERANCE * scale;
	if (Math.hypot(e0[0] + e2[0], e0[1] + e2[1]) > tol) return null;
	if (Math.hypot(e1[0] + e3[0], e1[1] + e3[1]) > tol) return null;
	if (Math.abs(e0[0] * e1[0] + e0[1] * e1[1]) > tol * scale) return null;
	let rotationDeg = (Math.atan2(e0[1], e0[0]) * 180) / Math.PI;
	if (rotationDeg > 90) rotationDeg -= 180;
	if (rotationDeg <= -90) rotationDeg += 180;
	// The plotter rounds corner coordinates to 1e-8; snap the angle to a micro-degree.
	rotationDeg = round(rotationDeg, 1e-6);
	// -0 would print as "-0" and compare unequal under Object.is.
	if (Object.is(rotationDeg, -0)) rotationDeg = 0;
	return {
		cx: (p0[0] + p1[0] + p2[0] + p3[0]) / 4,
		cy: (p0[1] + p1[1] + p2[1] + p3[1]) / 4,
		length,
		width,
		rotationDeg
	};
}

function signedArea(points: readonly GerberPoint[]): number {
	let twice = 0;
	for (let i = 0; i < points.length; i++) {
		const a = points[i];
		const b = points[(i + 1) % points.length];
		twice += a[0] * b[1] - b[0] * a[1];
	}
	return twice / 2;
}

function circlePoints(cx: number, cy: number, r: number, tolerance: number): GerberPoint[] {
	// A zero circle (e.g. a rounded-rectangle macro with radius 0) is just its centre.
	if (!(r > 0)) return [[cx, cy]];
	const n = Math.max(8, arcSegmentCount(r, 2 * Math.PI, tolerance));
	const out: GerberPoint[] = [];
	for (let k = 0; k < n; k++) {
		const a = (2 * Math.PI * k) / n;
		out.push([cx + r * Math.cos(a), cy + r * Math.sin(a)]);
	}
	return out;
}

/** Boundary points of a primitive; round parts are sampled on the true outline. */
function boundaryPoints(p: Drawable, tolerance: number): GerberPoint[] {
	if (p.type === 'circle') return circlePoints(p.cx, p.cy, p.r, tolerance);
	if (p.type === 'poly') return p.points;
	const hw = p.width / 2;
	const hh = p.height / 2;
	const r = Math.min(p.r, hw, hh);
	if (r <= 0) {
		return [
			[p.cx - hw, p.cy - hh],
			[p.cx + hw, p.cy - hh],
			[p.cx + hw, p.cy + hh],
			[p.cx - hw, p.cy + hh]
		];
	}
	// Corner circles of a rounded rectangle: the hull of their samples is the outline.
	return [
		...circlePoints(p.cx - hw + r, p.cy - hh + r, r, tolerance),
		...circlePoints(p.cx + hw - r, p.cy - hh + r, r, tolerance),
		...circlePoints(p.cx + hw - r, p.cy + hh - r, r, tolerance),
		...circlePoints(p.cx - hw + r, p.cy + hh - r, r, tolerance)
	];
}

function distanceToSegment(q: GerberPoint, a: GerberPoint, b: GerberPoint): number {
	const dx = b[0] - a[0];
	const dy = b[1] - a[1];
	const len2 = dx * dx + dy * dy;
	const along = len2 === 0 ? 0 : ((q[0] - a[0]) * dx + (q[1] - a[1]) * dy) / len2;
	const t = Math.max(0, Math.min(1, along));
	return Math.hypot(q[0] - a[0] - t * dx, q[1] - a[1] - t * dy);
}

function insidePolygon(q: GerberPoint, poly: readonly GerberPoint[], margin: number): boolean {
	let inside = false;
	for (let i = 0, j = poly.length - 1; i < poly.length; j = i++) {
		const a = poly[i];
		const b = poly[j];
		if (distanceToSegment(q, a, b) <= margin) return true;
		// Ray casting to +x: count the edges that straddle the ray's height right of q.
		if (a[1] > q[1] !== b[1] > q[1]) {
			const xCross = ((b[0] - a[0]) * (q[1] - a[1])) / (b[1] - a[1]) + a[0];
			if (q[0] < xCross) inside = !inside;
		}
	}
	return inside;
}

function covers(p: Drawable, q: GerberPoint, margin: number): boolean {
	if (p.type === 'circle') return Math.hypot(q[0] - p.cx, q[1] - p.cy) <= p.r + margin;
	if (p.type === 'poly') return insidePolygon(q, p.points, margin);
	const hw = p.width / 2;
	const hh = p.height / 2;
	const r = Math.min(p.r, hw, hh);
	// Distance from a rounded rectangle: shrink by r, then measure to the inner box.
	const dx = Math.max(Math.abs(q[0] - p.cx) - (hw - r), 0);
	const dy = Math.max(Math.abs(q[1] - p.cy) - (hh - r), 0);
	return Math.hypot(dx, dy) <= r + margin;
}

/**
 * True when every sample point of `hull` (a grid over its bounding box) lies in at least one
 * primitive, i.e. the primitives' union fills its convex hull (to within `margin`).
 */
function hullIsCovered(
	hull: readonly GerberPoint[],
	prims: readonly Drawable[],
	margin: number
): boolean {
	const xs = hull.map((p) => p[0]);
	const ys = hull.map((p) => p[1]);
	const [x0, x1, y0, y1] = [Math.min(...xs), Math.max(...xs), Math.min(...ys), Math.max(...ys)];
	for (let i = 0; i < COVERAGE_GRID; i++) {
		for (let j = 0; j < COVERAGE_GRID; j++) {
			const q: GerberPoint = [
				x0 + ((i + 0.5) * (x1 - x0)) / COVERAGE_GRID,
				y0 + ((j + 0.5) * (y1 - y0)) / COVERAGE_GRID
			];
			if (!insidePolygon(q, hull, 0)) continue;
			if (!prims.some((p) => covers(p, q, margin))) return false;
		}
	}
	return true;
}

type Rect = NonNullable<ReturnType<typeof rectangleFromCorners>>;

function asRectangle(p: Drawable): Rect | null {
	if (p.type === 'poly') return rectangleFromCorners(p.points);
	if (p.type === 'rect' && !(p.r > 0)) {
		return { cx: p.cx, cy: p.cy, length: p.width, width: p.height, rotationDeg: 0 };
	}
	return null;
}

/**
 * Recognise the usual CAD rounded rectangle: a rectangle body with a circle of one radius r on
 * each corner (plus, usually, side strips). When every primitive lies inside the rounded
 * rectangle with inner box = body and radius r, and the union already fills its convex hull,
 * the union is exactly that rounded rectangle (the hull of the four corner circles).
 */
function roundedRectangleOf(
	prims: readonly Drawable[],
	tolerance: number,
	margin: number
): Extract<GerberOutline, { kind: 'rectangle' }> | null {
	const circles = prims.filter((p) => p.type === 'circle');
	if (circles.length < 4) return null;
	const r = circles[0].r;
	if (!circles.every((c) => Math.abs(c.r - r) <= margin)) return null;
	for (const body of prims.map(asRectangle)) {
		if (!body) continue;
		const a = (body.rotationDeg * Math.PI) / 180;
		const [cos, sin] = [Math.cos(a), Math.sin(a)];
		const [hl, hw] = [body.length / 2, body.width / 2];
		// Local frame of the body: u along its length, v along its width.
		const local = (q: GerberPoint) => {
			const [dx, dy] = [q[0] - body.cx, q[1] - body.cy];
			return [dx * cos + dy * sin, -dx * sin + dy * cos];
		};
		const corners = [
			[-hl, -hw],
			[hl, -hw],
			[hl, hw],
			[-hl, hw]
		];
		const onCorner = corners.every(([u, v]) =>
			circles.some((c) => {
				const [cu, cv] = local([c.cx, c.cy]);
				return Math.hypot(cu - u, cv - v) <= margin;
			})
		);
		if (!onCorner) continue;
		const inside = prims
			.flatMap((p) => boundaryPoints(p, tolerance))
			.every((q) => {
				const [u, v] = local(q);
				const du = Math.max(Math.abs(u) - hl, 0);
				const dv = Math.max(Math.abs(v) - hw, 0);
				return Math.hypot(du, dv) <= r + margin;
			});
		if (!inside) continue;
		return {
			kind: 'rectangle',
			length: body.length + 2 * r,
			width: body.width + 2 * r,
			cornerRadius: r,
			cx: body.cx,
			cy: body.cy,
			rotationDeg: body.rotationDeg
		};
	}
	return null;
}

/**
 * Outline of a macro aperture relative to its flash point, in file units, or the reason it is
 * skipped. Used by the Gerber importer for each flashed macro D-code.
 * - one circle → circle; one unrotated rect → rectangle; a four-corner rectangle polygon
 *   (rotated center line 21 or vector line 20) → rotated rectangle; other polygons → polygon;
 * - several dark primitives → their convex hull, only if a 48×48 sample grid shows the hull is
 *   filled; a body rectangle with equal circles on its corners (the usual CAD rounded-rectangle
 *   macro of outline 4, circles 1 and lines 20) → an exact rounded rectangle, any other convex
 *   union → hull polygon; non-convex unions are skipped, as are clear (exposure-off), moiré and
 *   thermal primitives.
 * Reference: Gerber Layer Format Specification (Ucamco), "Macro aperture primitives".
 * @param tolerance largest chord-to-arc deviation when circles are sampled, in file units.
 * @example macroShapeOutline([{ type: 'circle', r: 0.5, cx: 0, cy: 0 }], 0.0005)
 * // { outline: { kind: 'circle', diameter: 1, cx: 0, cy: 0 } }
 */
export function macroShapeOutline(
	shape: readonly GerberPadPrimitive[],
	tolerance: number
): GerberOutlineResult {
	if (shape.some((p) => p.type === 'ring' || p.type === 'clip')) {
		return { skipReason: 'uses a moiré or thermal primitive (6 or 7), not a paste opening' };
	}
	if (shape.some((p) => p.type === 'layer' && p.polarity === 'clear')) {
		return { skipReason: 'uses exposure-off primitives (cut-outs), which cannot be represented' };
	}
	const prims = shape.filter(
		(p): p is Drawable => p.type === 'circle' || p.type === 'rect' || p.type === 'poly'
	);
	if (prims.length === 0) return { skipReason: 'has no primitives' };
	if (prims.length === 1) {
		const p = prims[0];
		if (p.type === 'circle') {
			if (!(p.r > 0)) return { skipReason: 'has zero size' };
			return { outline: { kind: 'circle', diameter: 2 * p.r, cx: p.cx, cy: p.cy } };
		}
		if (p.type === 'rect') {
			if (!(p.width > 0 && p.height > 0)) return { skipReason: 'has zero size' };
			const cornerRadius = Math.min(p.r, p.width / 2, p.height / 2);
			const { width: length, height: width, cx, cy } = p;
			return {
				outline: { kind: 'rectangle', length, width, cornerRadius, cx, cy, rotationDeg: 0 }
			};
		}
		if (!p.points.every((q) => Number.isFinite(q[0]) && Number.isFinite(q[1]))) {
			return { skipReason: 'has a primitive with non-numeric coordinates' };
		}
		if (signedArea(p.points) === 0) return { skipReason: 'has zero area' };
		const rect = rectangleFromCorners(p.points);
		if (rect) return { outline: { kind: 'rectangle', cornerRadius: 0, ...rect } };
		const vertices = p.points.map((q): GerberPoint => [q[0], q[1]]);
		return { outline: { kind: 'polygon', vertices, cx: 0, cy: 0, rotationDeg: 0 } };
	}
	const points = prims.flatMap((p) => boundaryPoints(p, tolerance));
	if (!points.every((q) => Number.isFinite(q[0]) && Number.isFinite(q[1]))) {
		return { skipReason: 'has a primitive with non-numeric coordinates' };
	}
	const hull = convexHull(points);
	if (hull.length < 3 || signedArea(hull) === 0) return { skipReason: 'has zero area' };
	const xs = hull.map((p) => p[0]);
	const ys = hull.map((p) => p[1]);
	const size = Math.hypot(Math.max(...xs) - Math.min(...xs), Math.max(...ys) - Math.min(...ys));
	// Margin: chord sampling makes the hull lie a sagitta inside curved parts; allow that.
	const margin = Math.max(2 * tolerance, 1e-6 * size);
	if (!hullIsCovered(hull, prims, margin)) {
		const what = `combines ${prims.length} primitives into a non-convex shape`;
		return { skipReason: `${what}, which is not supported (export it as a region instead)` };
	}
	const rounded = roundedRectangleOf(prims, tolerance, margin);
	if (rounded) return { outline: rounded };
	return { outline: { kind: 'polygon', vertices: hull, cx: 0, cy: 0, rotationDeg: 0 } };
}
