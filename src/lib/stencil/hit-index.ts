/**
 * Which aperture is under the pointer: a uniform grid over the apertures' bounding boxes, then an
 * exact point-in-outline test on the few candidates of one cell. Lets the aperture map draw all
 * outlines as one path per status and still answer hover and click in microseconds.
 */
import { effectiveShape, type ApertureInput, type PointUm } from './aperture';
import { checkAperture } from './aperture-validation';
import { validApertureBoundsUm, type BoundsUm } from './outline';
import { openPolygon } from './polygon';

/** The server checked every outline for crossings; the map only needs drawable numbers. */
const MAP_CHECK = { outlineCrossing: false };

/** A spatial grid over a list of apertures; build with `buildHitIndex`. */
export interface ApertureHitIndex {
	readonly apertures: readonly ApertureInput[];
	/** Bounding box of each aperture by list index; null when the aperture is invalid. */
	readonly boxes: readonly (BoundsUm | null)[];
	readonly originXUm: number;
	readonly originYUm: number;
	readonly cellUm: number;
	readonly columns: number;
	readonly rows: number;
	/** Compressed cells: the aperture indices of cell c are items[start[c] .. start[c + 1]). */
	readonly start: Int32Array;
	readonly items: Int32Array;
}

/** Cells per aperture, on average; a handful of candidates per cell keeps a query cheap. */
const CELLS_PER_APERTURE = 1;

/**
 * Build the grid. The cell size follows the stencil's area divided by the aperture count, so a
 * cell holds about one aperture whatever the density; an aperture is listed in every cell its
 * bounding box touches. Invalid apertures are left out (they cannot be drawn either).
 * O(n + cells) time and memory.
 * @example const index = buildHitIndex(apertures); apertureAt(index, [1200, 340]) // 17 or null
 */
export function buildHitIndex(apertures: readonly ApertureInput[]): ApertureHitIndex {
	const boxes = apertures.map((a) =>
		checkAperture(a, undefined, undefined, MAP_CHECK).length > 0 ? null : validApertureBoundsUm(a)
	);
	let x0 = Infinity;
	let y0 = Infinity;
	let x1 = -Infinity;
	let y1 = -Infinity;
	let valid = 0;
	for (const b of boxes) {
		if (!b) continue;
		valid++;
		x0 = Math.min(x0, b.xMinUm);
		y0 = Math.min(y0, b.yMinUm);
		x1 = Math.max(x1, b.xMaxUm);
		y1 = Math.max(y1, b.yMaxUm);
	}
	if (valid === 0) {
		return {
			apertures,
			boxes,
			originXUm: 0,
			originYUm: 0,
			cellUm: 1,
			columns: 0,
			rows: 0,
			start: new Int32Array(1),
			items: new Int32Array(0)
		};
	}
	const width = Math.max(x1 - x0, 1e-6);
	const height = Math.max(y1 - y0, 1e-6);
	const cellUm = Math.max(Math.sqrt((width * height) / (valid * CELLS_PER_APERTURE)), 1e-6);
	const columns = Math.max(1, Math.ceil(width / cellUm));
	const rows = Math.max(1, Math.ceil(height / cellUm));
	const column = (x: number) => Math.min(columns - 1, Math.max(0, Math.floor((x - x0) / cellUm)));
	const row = (y: number) => Math.min(rows - 1, Math.max(0, Math.floor((y - y0) / cellUm)));
	// Two passes (count, then fill) give flat typed arrays instead of 20,000 small JS arrays.
	const start = new Int32Array(columns * rows + 1);
	const visit = (b: BoundsUm, each: (cell: number) => void) => {
		for (let r = row(b.yMinUm), r1 = row(b.yMaxUm); r <= r1; r++)
			for (let c = column(b.xMinUm), c1 = column(b.xMaxUm); c <= c1; c++) each(r * columns + c);
	};
	for (const b of boxes) if (b) visit(b, (cell) => start[cell + 1]++);
	for (let c = 0; c < columns * rows; c++) start[c + 1] += start[c];
	const items = new Int32Array(start[columns * rows]);
	const fill = start.slice(0, columns * rows);
	boxes.forEach((b, i) => {
		if (b) visit(b, (cell) => (items[fill[cell]++] = i));
	});
	return { apertures, boxes, originXUm: x0, originYUm: y0, cellUm, columns, rows, start, items };
}

/** Point on segment a–b (within a relative tolerance), for boundary points of polygons. */
function onSegment([px, py]: PointUm, [ax, ay]: PointUm, [bx, by]: PointUm): boolean {
	const cross = (bx - ax) * (py - ay) - (by - ay) * (px - ax);
	const length = Math.hypot(bx - ax, by - ay);
	if (Math.abs(cross) > 1e-9 * Math.max(1, length * length)) return false;
	return (
		px >= Math.min(ax, bx) - 1e-9 &&
		px <= Math.max(ax, bx) + 1e-9 &&
		py >= Math.min(ay, by) - 1e-9 &&
		py <= Math.max(ay, by) + 1e-9
	);
}

/**
 * Point-in-polygon by the even-odd crossing rule (a ray to +x), boundary counted as inside.
 * @example pointInPolygon([1, 1], [[0, 0], [2, 0], [2, 2], [0, 2]]) // true
 */
export function pointInPolygon(point: PointUm, vertices: readonly PointUm[]): boolean {
	const [px, py] = point;
	let inside = false;
	for (let i = 0, j = vertices.length - 1; i < vertices.length; j = i++) {
		const a = vertices[i];
		const b = vertices[j];
		if (onSegment(point, a, b)) return true;
		if (a[1] > py !== b[1] > py && px < ((b[0] - a[0]) * (py - a[1])) / (b[1] - a[1]) + a[0])
			inside = !inside;
	}
	return inside;
}

/** A stencil point in the aperture's own frame: undo the position, then the rotation (by −θ). */
function toApertureFrame(aperture: ApertureInput, [x, y]: PointUm): PointUm {
	const t = (aperture.rotationDeg * Math.PI) / 180;
	const c = Math.cos(t);
	const s = Math.sin(t);
	const dx = x - aperture.xUm;
	const dy = y - aperture.yUm;
	return [dx * c + dy * s, -dx * s + dy * c];
}

/**
 * Whether a stencil point (µm, y up) lies inside the placed aperture opening, boundary included.
 * The point is turned into the aperture's own frame (undo the position, then the rotation), where
 * a rectangle is |x| ≤ L/2 and |y| ≤ W/2, a rounded rectangle also needs the corner distance
 * ≤ r, a circle is x² + y² ≤ (D/2)², and a polygon uses the crossing rule on its vertex list.
 * The aperture is assumed valid (as stored).
 * @example pointInAperture(rect(1000, 200), [499, 99]) // true
 */
export function pointInAperture(aperture: ApertureInput, point: PointUm): boolean {
	const [lx, ly] = toApertureFrame(aperture, point);
	const eps = 1e-9;
	switch (effectiveShape(aperture)) {
		case 'circle': {
			const r = aperture.diameterUm! / 2;
			return lx * lx + ly * ly <= r * r * (1 + eps);
		}
		case 'polygon':
			return pointInPolygon([lx, ly], openPolygon(aperture.verticesUm!));
		default: {
			const hx = aperture.lengthUm! / 2;
			const hy = aperture.widthUm! / 2;
			const ax = Math.abs(lx);
			const ay = Math.abs(ly);
			if (ax > hx * (1 + eps) || ay > hy * (1 + eps)) return false;
			const r = aperture.cornerRadiusUm ?? 0;
			if (r <= 0) return true;
			const qx = Math.max(ax - (hx - r), 0);
			const qy = Math.max(ay - (hy - r), 0);
			return qx * qx + qy * qy <= r * r * (1 + eps);
		}
	}
}

/** Distance from a point to a box (0 inside). */
function distanceToBox([x, y]: PointUm, b: BoundsUm): number {
	const dx = Math.max(b.xMinUm - x, 0, x - b.xMaxUm);
	const dy = Math.max(b.yMinUm - y, 0, y - b.yMaxUm);
	return Math.hypot(dx, dy);
}

/** Distance from a point to segment a–b. */
function distanceToSegment([px, py]: PointUm, [ax, ay]: PointUm, [bx, by]: PointUm): number {
	const vx = bx - ax;
	const vy = by - ay;
	const lengthSquared = vx * vx + vy * vy;
	const u =
		lengthSquared === 0
			? 0
			: Math.min(1, Math.max(0, ((px - ax) * vx + (py - ay) * vy) / lengthSquared));
	return Math.hypot(px - (ax + u * vx), py - (ay + u * vy));
}

/**
 * Distance (µm) from a stencil point to the placed aperture opening; 0 inside or on the edge.
 * Circle: |p| − D/2; rounded rectangle: distance to the inner rectangle shrunk by r, minus r
 * (r = 0 is the plain rectangle); polygon: the nearest edge. The aperture is assumed valid.
 * @example distanceToAperture(circle(500), [300, 400]) // 250
 */
export function distanceToAperture(aperture: ApertureInput, point: PointUm): number {
	if (pointInAperture(aperture, point)) return 0;
	const [lx, ly] = toApertureFrame(aperture, point);
	switch (effectiveShape(aperture)) {
		case 'circle':
			return Math.max(0, Math.hypot(lx, ly) - aperture.diameterUm! / 2);
		case 'polygon': {
			const v = openPolygon(aperture.verticesUm!);
			let best = Infinity;
			for (let i = 0, j = v.length - 1; i < v.length; j = i++)
				best = Math.min(best, distanceToSegment([lx, ly], v[j], v[i]));
			return best;
		}
		default: {
			const r = aperture.cornerRadiusUm ?? 0;
			const qx = Math.max(Math.abs(lx) - (aperture.lengthUm! / 2 - r), 0);
			const qy = Math.max(Math.abs(ly) - (aperture.widthUm! / 2 - r), 0);
			return Math.max(0, Math.hypot(qx, qy) - r);
		}
	}
}

/**
 * The list index of the aperture under a stencil point (µm, y up), or null. When openings
 * overlap, the smallest one wins (it would be hidden under the larger one otherwise). When the
 * point is in no opening, the nearest aperture within `toleranceUm` of its outline is taken, so a
 * pointer a few pixels off a tiny aperture on a zoomed-out map still finds it.
 * @example apertureAt(buildHitIndex([rect(1000, 200)]), [0, 0]) // 0
 */
export function apertureAt(
	index: ApertureHitIndex,
	point: PointUm,
	toleranceUm = 0
): number | null {
	if (index.columns === 0) return null;
	const tol = Number.isFinite(toleranceUm) ? Math.max(0, toleranceUm) : 0;
	const [x, y] = point;
	const c0 = Math.max(0, Math.floor((x - tol - index.originXUm) / index.cellUm));
	const c1 = Math.min(index.columns - 1, Math.floor((x + tol - index.originXUm) / index.cellUm));
	const r0 = Math.max(0, Math.floor((y - tol - index.originYUm) / index.cellUm));
	const r1 = Math.min(index.rows - 1, Math.floor((y + tol - index.originYUm) / index.cellUm));
	let hit: number | null = null;
	let hitArea = Infinity;
	let near: number | null = null;
	let nearDistance = Infinity;
	for (let r = r0; r <= r1; r++)
		for (let c = c0; c <= c1; c++) {
			const cell = r * index.columns + c;
			for (let k = index.start[cell]; k < index.start[cell + 1]; k++) {
				const i = index.items[k];
				const b = index.boxes[i]!;
				if (distanceToBox(point, b) > tol) continue;
				const aperture = index.apertures[i];
				if (pointInAperture(aperture, point)) {
					const area = (b.xMaxUm - b.xMinUm) * (b.yMaxUm - b.yMinUm);
					if (area < hitArea) {
						hit = i;
						hitArea = area;
					}
				} else if (hit === null && tol > 0) {
					const distance = distanceToAperture(aperture, point);
					if (distance <= tol && distance < nearDistance) {
						near = i;
						nearDistance = distance;
					}
				}
			}
		}
	return hit ?? near;
}
