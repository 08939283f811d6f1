/**
 * Plane-polygon helpers for polygonal apertures (µm). Pure functions on vertex lists; a vertex
 * list is the outline in order, without the first vertex repeated at the end.
 */
import type { PointUm } from './aperture';

/**
 * Drop a closing vertex that repeats the first one (Gerber regions and many CAD exports close
 * their contours that way). Returns the list itself when it is already open (no copy: reads of
 * large outlines made one per check), else a shortened copy; callers must not change it.
 * @example openPolygon([[0,0],[1,0],[0,1],[0,0]]) // [[0,0],[1,0],[0,1]]
 */
export function openPolygon(vertices: readonly PointUm[]): readonly PointUm[] {
	if (vertices.length > 1) {
		const first = vertices[0];
		const last = vertices[vertices.length - 1];
		if (first[0] === last[0] && first[1] === last[1]) return vertices.slice(0, -1);
	}
	return vertices;
}

/**
 * Signed shoelace area (positive for counter-clockwise order). Gauss's area formula.
 * @example polygonSignedArea([[0,0],[2,0],[2,1],[0,1]]) // 2
 */
export function polygonSignedArea(vertices: readonly PointUm[]): number {
	let twice = 0;
	for (let i = 0, n = vertices.length; i < n; i++) {
		const [x1, y1] = vertices[i];
		const [x2, y2] = vertices[(i + 1) % n];
		twice += x1 * y2 - x2 * y1;
	}
	return twice / 2;
}

/**
 * Unsigned shoelace area in µm² (either vertex order).
 * @example polygonAreaUm2([[0,0],[0,1],[2,1],[2,0]]) // 2
 */
export function polygonAreaUm2(vertices: readonly PointUm[]): number {
	return Math.abs(polygonSignedArea(vertices));
}

/**
 * Perimeter in µm: the sum of the edge lengths of the closed outline.
 * @example polygonPerimeterUm([[0,0],[3,0],[3,4]]) // 12
 */
export function polygonPerimeterUm(vertices: readonly PointUm[]): number {
	let sum = 0;
	for (let i = 0, n = vertices.length; i < n; i++) {
		const [x1, y1] = vertices[i];
		const [x2, y2] = vertices[(i + 1) % n];
		sum += Math.hypot(x2 - x1, y2 - y1);
	}
	return sum;
}

/**
 * Area centroid of a simple polygon with non-zero area (standard first-moment formula).
 * @throws {RangeError} when the area is zero.
 * @example polygonCentroid([[0,0],[2,0],[2,2],[0,2]]) // [1, 1]
 */
export function polygonCentroid(vertices: readonly PointUm[]): PointUm {
	const a = polygonSignedArea(vertices);
	if (a === 0) throw new RangeError('polygon centroid: the polygon has zero area');
	let cx = 0;
	let cy = 0;
	for (let i = 0, n = vertices.length; i < n; i++) {
		const [x1, y1] = vertices[i];
		const [x2, y2] = vertices[(i + 1) % n];
		const cross = x1 * y2 - x2 * y1;
		cx += (x1 + x2) * cross;
		cy += (y1 + y2) * cross;
	}
	return [cx / (6 * a), cy / (6 * a)];
}

function cross(o: PointUm, a: PointUm, b: PointUm): number {
	return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
}

/**
 * Convex hull by Andrew's monotone chain, counter-clockwise, collinear points removed.
 * @example convexHull([[0,0],[1,1],[2,0],[1,0.2],[1,-1]]).length // 4
 */
export function convexHull(points: readonly PointUm[]): PointUm[] {
	const pts = [...points].sort((p, q) => p[0] - q[0] || p[1] - q[1]);
	if (pts.length < 3) return pts.map((p) => [p[0], p[1]] as PointUm);
	const lower: PointUm[] = [];
	for (const p of pts) {
		while (lower.length >= 2 && cross(lower[lower.length - 2], lower[lower.length - 1], p) <= 0)
			lower.pop();
		lower.push(p);
	}
	const upper: PointUm[] = [];
	for (let i = pts.length - 1; i >= 0; i--) {
		const p = pts[i];
		while (upper.length >= 2 && cross(upper[upper.length - 2], upper[upper.length - 1], p) <= 0)
			upper.pop();
		upper.push(p);
	}
	lower.pop();
	upper.pop();
	return lower.concat(upper).map((p) => [p[0], p[1]] as PointUm);
}

/**
 * Minimum caliper width: the smallest distance between two parallel lines enclosing the
 * polygon. The minimum is always attained with one line along a hull edge (Toussaint 1983,
 * "Solving geometric problems with the rotating calipers"), so each hull edge is tried with its
 * farthest hull vertex, found by rotating calipers: the farthest vertex only moves forward as
 * the edge turns, so the whole walk is O(h) after the O(n log n) hull (an O(h²) scan of every
 * vertex per edge took seconds for a thousand-vertex outline). For a non-convex polygon this is
 * the width of its convex hull, an approximation of the narrowest opening (a thin tab on a wide
 * pad is not detected).
 * @example polygonMinWidthUm([[0,0],[10,0],[10,2],[0,2]]) // 2
 */
export function polygonMinWidthUm(vertices: readonly PointUm[]): number {
	const hull = convexHull(vertices);
	const n = hull.length;
	if (n < 3) return 0;
	let best = Infinity;
	let j = 1;
	for (let i = 0; i < n; i++) {
		const a = hull[i];
		const b = hull[(i + 1) % n];
		const len = Math.hypot(b[0] - a[0], b[1] - a[1]);
		// The hull is counter-clockwise, so cross(a, b, p) ≥ 0 for every hull vertex p.
		if (j < i + 1) j = i + 1;
		while (j + 1 < i + n && cross(a, b, hull[(j + 1) % n]) >= cross(a, b, hull[j % n])) j++;
		best = Math.min(best, cross(a, b, hull[j % n]) / len);
	}
	return best;
}

function onSegment(a: PointUm, b: PointUm, p: PointUm): boolean {
	return (
		Math.min(a[0], b[0]) <= p[0] &&
		p[0] <= Math.max(a[0], b[0]) &&
		Math.min(a[1], b[1]) <= p[1] &&
		p[1] <= Math.max(a[1], b[1])
	);
}

function segmentsTouch(a: PointUm, b: PointUm, c: PointUm, d: PointUm): boolean {
	const d1 = Math.sign(cross(c, d, a));
	const d2 = Math.sign(cross(c, d, b));
	const d3 = Math.sign(cross(a, b, c));
	const d4 = Math.sign(cross(a, b, d));
	if (d1 * d2 < 0 && d3 * d4 < 0) return true;
	if (d1 === 0 && onSegment(c, d, a)) return true;
	if (d2 === 0 && onSegment(c, d, b)) return true;
	if (d3 === 0 && onSegment(a, b, c)) return true;
	if (d4 === 0 && onSegment(a, b, d)) return true;
	return false;
}

/**
 * Find a pair of edges that cross or touch, other than neighbours meeting at their shared
 * vertex; a neighbour that doubles back along its predecessor also counts. Edge i runs from
 * vertex i to vertex i+1. Edges are swept in order of their smallest x, and only pairs whose
 * boxes overlap are tested exactly, so an ordinary outline of n vertices costs about n log n
 * (every pair was tested before: a thousand-vertex outline took a million tests, and a stencil
 * of such outlines minutes).
 * @returns the two edge indices (smaller first), or null when the polygon is simple.
 * @example findSelfIntersection([[0,0],[2,2],[2,0],[0,2]]) // [0, 2]
 */
export function findSelfIntersection(vertices: readonly PointUm[]): [number, number] | null {
	const n = vertices.length;
	if (n > 2)
		for (let i = 0; i < n; i++) {
			const a = vertices[i];
			const b = vertices[(i + 1) % n];
			const c = vertices[(i + 2) % n];
			// Neighbouring edges share vertex b; they overlap only if c turns straight back.
			if (cross(a, b, c) === 0) {
				const dot = (b[0] - a[0]) * (c[0] - b[0]) + (b[1] - a[1]) * (c[1] - b[1]);
				if (dot < 0) return [i, (i + 1) % n].sort((p, q) => p - q) as [number, number];
			}
		}
	const minX = new Float64Array(n);
	const maxX = new Float64Array(n);
	const minY = new Float64Array(n);
	const maxY = new Float64Array(n);
	for (let i = 0; i < n; i++) {
		const a = vertices[i];
		const b = vertices[(i + 1) % n];
		minX[i] = Math.min(a[0], b[0]);
		maxX[i] = Math.max(a[0], b[0]);
		minY[i] = Math.min(a[1], b[1]);
		maxY[i] = Math.max(a[1], b[1]);
	}
	const order = Array.from({ length: n }, (_, i) => i).sort((p, q) => minX[p] - minX[q]);
	let found: [number, number] | null = null;
	for (let k = 0; k < n; k++) {
		const i = order[k];
		for (let m = k + 1; m < n && minX[order[m]] <= maxX[i]; m++) {
			const j = order[m];
			const lo = Math.min(i, j);
			const hi = Math.max(i, j);
			if (hi - lo === 1 || (lo === 0 && hi === n - 1)) continue; // neighbours
			if (minY[j] > maxY[i] || maxY[j] < minY[i]) continue;
			if (found && (lo > found[0] || (lo === found[0] && hi >= found[1]))) continue;
			const a = vertices[lo];
			const b = vertices[(lo + 1) % n];
			if (segmentsTouch(a, b, vertices[hi], vertices[(hi + 1) % n])) found = [lo, hi];
		}
	}
	return found;
}
