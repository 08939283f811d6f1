/**
 * Region contours that cross or touch themselves, made into simple polygons (or refused).
 *
 * Gerber Layer Format Specification (Ucamco, revision 2022.02), 4.10.3 "Valid Contours": a
 * contour must not self-intersect; the one exception is a cut-in, two fully-coincident
 * horizontal or vertical segments joining a hole to its enclosing contour. The inside of a valid
 * contour has winding number +1 or −1 everywhere (one sign, the contour's orientation, which is
 * not significant) and the outside 0; "an invalid contour has no specified interpretation".
 *
 * So the fill here is the nonzero winding rule, computed by `polygon-clipping` (the union of
 * the contour with itself): it is the specified fill for every valid contour, cut-ins included,
 * and for a contour whose loops all turn the same way (a self-overlapping loop) it is the union
 * of the loops, as 4.10.1 unites overlapping contours. A contour with loops turning both ways
 * (a bow-tie, a figure-eight) has no side that is "inside" throughout (4.10.3, a cut-in contour:
 * "the inside must always be to the same side"): which loops the writer meant is not known, so
 * it is refused. A hole left by a cut-in is kept, joined to the outside by a slit of
 * `CUT_IN_SLIT_UM` so the opening is one simple polygon (the perturbation 4.10.3 describes for
 * weakly simple contours), its area short by the slit's width times its length.
 */
import type { PointUm } from './aperture';
import { findSelfIntersection, polygonAreaUm2, polygonSignedArea } from './polygon';
import polygonClipping from 'polygon-clipping';
import { clippedArea, openRing, unite, type ClippedPolygon } from './polygon-union';
import { NUMBER_RANGES, RELATIVE_TOLERANCE } from './limits';

/** Width of the slit joining a cut-in hole to the outside, µm: 10 nm, on the 1 nm snapping grid. */
export const CUT_IN_SLIT_UM = 0.01;

/**
 * Most edge pairs of one contour that may cross or touch before it is refused: the repair's cost
 * grows with the crossings (about 0.1 ms each; a 999-point star with 250,000 took 52 s), and a
 * real pad crosses itself a few times at most.
 */
export const MAX_CONTOUR_CROSSINGS = 1_000;

/** Most crossings repaired in one layer, all contours together (about a second of work). */
export const MAX_LAYER_CROSSINGS = 10_000;

/** Smallest piece kept as an opening, µm²: a square of the smallest aperture size. */
const MIN_PIECE_AREA_UM2 = NUMBER_RANGES.minApertureSizeUm ** 2;

/** What became of a contour (vertices in any unit with `f` µm per unit). */
export type ContourRepair =
	| { kind: 'simple' }
	| {
			kind: 'repaired';
			/** Where the first crossing or touch is, in contour units. */
			at: PointUm;
			/** True when edges cross or overlap (not only a cut-in touching). */
			crossed: boolean;
			/** Simple polygons (contour units), each an opening. */
			pieces: PointUm[][];
			/** Holes joined to the outside by a slit. */
			holesJoined: number;
			/** Pieces below pad size (under 1 µm²) left out. */
			dropped: number;
			/** Pairs of edges that cross or touch. */
			crossings: number;
	  }
	| {
			kind: 'refused';
			at: PointUm;
			reason: string;
			/** Crossings counted, up to one more than the cap (over it, nothing was repaired). */
			crossings: number;
	  };

function cross(o: PointUm, a: PointUm, b: PointUm): number {
	return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
}

/** Whether segments ab and cd share a point (a crossing, a touch or an overlap). */
function segmentsMeet(a: PointUm, b: PointUm, c: PointUm, d: PointUm): boolean {
	const d1 = Math.sign(cross(c, d, a));
	const d2 = Math.sign(cross(c, d, b));
	const d3 = Math.sign(cross(a, b, c));
	const d4 = Math.sign(cross(a, b, d));
	if (d1 * d2 < 0 && d3 * d4 < 0) return true;
	const inBox = (p: PointUm, q: PointUm, r: PointUm) =>
		Math.min(q[0], r[0]) <= p[0] &&
		p[0] <= Math.max(q[0], r[0]) &&
		Math.min(q[1], r[1]) <= p[1] &&
		p[1] <= Math.max(q[1], r[1]);
	return (
		(d1 === 0 && inBox(a, c, d)) ||
		(d2 === 0 && inBox(b, c, d)) ||
		(d3 === 0 && inBox(c, a, b)) ||
		(d4 === 0 && inBox(d, a, b))
	);
}

/**
 * Count the pairs of non-neighbouring edges that meet, stopping past `cap`: the same sweep as
 * `findSelfIntersection` (edges by smallest x, only pairs whose boxes overlap tested exactly).
 */
export function countSelfCrossings(v: readonly PointUm[], cap: number): number {
	const n = v.length;
	const minX = new Float64Array(n);
	const maxX = new Float64Array(n);
	const minY = new Float64Array(n);
	const maxY = new Float64Array(n);
	for (let i = 0; i < n; i++) {
		const [a, b] = [v[i], v[(i + 1) % n]];
		[minX[i], maxX[i]] = [Math.min(a[0], b[0]), Math.max(a[0], b[0])];
		[minY[i], maxY[i]] = [Math.min(a[1], b[1]), Math.max(a[1], b[1])];
	}
	const order = Array.from({ length: n }, (_, i) => i).sort((p, q) => minX[p] - minX[q]);
	let count = 0;
	for (let k = 0; k < n && count <= cap; k++) {
		const i = order[k];
		for (let m = k + 1; m < n && minX[order[m]] <= maxX[i] && count <= cap; m++) {
			const j = order[m];
			const [lo, hi] = [Math.min(i, j), Math.max(i, j)];
			if (hi - lo === 1 || (lo === 0 && hi === n - 1)) continue; // neighbours
			if (minY[j] > maxY[i] || maxY[j] < minY[i]) continue;
			if (segmentsMeet(v[lo], v[(lo + 1) % n], v[hi], v[(hi + 1) % n])) count++;
		}
	}
	return count;
}

/** The point where edges i and j of a closed polygon first meet (a crossing or a touch). */
function meetingPoint(v: readonly PointUm[], i: number, j: number): PointUm {
	const n = v.length;
	const [a, b, c, d] = [v[i], v[(i + 1) % n], v[j], v[(j + 1) % n]];
	const rx = b[0] - a[0];
	const ry = b[1] - a[1];
	const sx = d[0] - c[0];
	const sy = d[1] - c[1];
	const denom = rx * sy - ry * sx;
	if (denom !== 0) {
		const t = ((c[0] - a[0]) * sy - (c[1] - a[1]) * sx) / denom;
		return [a[0] + t * rx, a[1] + t * ry];
	}
	// Parallel (collinear overlap or a doubling back): an end of one edge lying on the other.
	const on = (p: PointUm, q: PointUm, r: PointUm) =>
		Math.min(q[0], r[0]) <= p[0] &&
		p[0] <= Math.max(q[0], r[0]) &&
		Math.min(q[1], r[1]) <= p[1] &&
		p[1] <= Math.max(q[1], r[1]);
	for (const [p, q, r] of [
		[c, a, b],
		[d, a, b],
		[a, c, d],
		[b, c, d]
	] as const)
		if (on(p, q, r)) return p;
	return b;
}

/** Join every hole of `poly` (µm, on the 1 nm grid) to the outside with a horizontal slit. */
function joinHoles(poly: ClippedPolygon, slitUm: number): ClippedPolygon[] | null {
	const minX = Math.min(...poly[0].map((p) => p[0]));
	const slits = poly.slice(1).map((hole) => {
		// From the hole's leftmost (then lowest) vertex leftwards past the outline: the slit's
		// box overlaps the hole next to that vertex, whatever the angles of its two edges.
		const v = hole.reduce((m, p) => (p[0] < m[0] || (p[0] === m[0] && p[1] < m[1]) ? p : m));
		const [x0, x1] = [minX - 1, v[0] + slitUm];
		const [y0, y1] = [v[1] - slitUm / 2, v[1] + slitUm / 2];
		return [
			[
				[x0, y0],
				[x1, y0],
				[x1, y1],
				[x0, y1],
				[x0, y0]
			]
		] as ClippedPolygon;
	});
	const pieces = polygonClipping.difference(poly, ...slits) as ClippedPolygon[];
	return pieces.some((p) => p.length > 1) ? null : pieces;
}

/**
 * Check a region contour (open vertex list, in file units with `f` µm per unit) and, when it
 * crosses or touches itself, repair it into simple polygons by the nonzero winding rule, or
 * refuse it (loops turning both ways). The crossing test is the edge sweep of
 * `findSelfIntersection` (sorted by x, boxes compared: about n log n for an outline); the repair
 * runs only for the contours it flags.
 * @example repairRegionContour([[0,0],[4,0],[4,3],[1,3],[1,1],[3,1],[3,2],[0,2]], 1000).kind // 'repaired'
 */
export function repairRegionContour(
	vertices: readonly PointUm[],
	f: number,
	maxCrossings = MAX_CONTOUR_CROSSINGS
): ContourRepair {
	const hit = findSelfIntersection(vertices);
	if (!hit) return { kind: 'simple' };
	const at = meetingPoint(vertices, hit[0], hit[1]);
	// Counted before the repair, whose work grows with them.
	const crossings = countSelfCrossings(vertices, maxCrossings);
	if (crossings > maxCrossings) {
		const reason =
			`its edges cross or touch more than ${maxCrossings.toLocaleString('en-US')} times, ` +
			'more than a pad outline has; not repaired';
		return { kind: 'refused', at, reason, crossings };
	}
	// In µm so the 1 nm snapping of polygon-union applies as meant.
	const um = vertices.map(([x, y]) => [x * f, y * f] as PointUm);
	const netUm2 = Math.abs(polygonSignedArea(um));
	let filled: ClippedPolygon[];
	try {
		filled = unite([um]);
	} catch {
		const reason = 'the polygon library could not untangle it';
		return { kind: 'refused', at, reason, crossings };
	}
	const fillUm2 = clippedArea(filled);
	const tol = RELATIVE_TOLERANCE * Math.max(fillUm2, netUm2) + 1;
	if (fillUm2 - netUm2 > tol) {
		// Loops turning the other way count negatively in the net area but are filled.
		const reason =
			`its loops turn both ways (net area ${(netUm2 / 1e6).toFixed(4)} mm² against ` +
			`${(fillUm2 / 1e6).toFixed(4)} mm² enclosed), so no side is inside throughout and ` +
			'which loops are the pad is not defined (Gerber specification 4.10.3)';
		return { kind: 'refused', at, reason, crossings };
	}
	// More net area than filled: loops lie over one another, so edges cross (a cut-in only touches).
	const crossed = netUm2 - fillUm2 > tol;
	const holesJoined = filled.reduce((s, p) => s + p.length - 1, 0);
	const simple: ClippedPolygon[] = [];
	for (const poly of filled) {
		if (poly.length === 1) {
			simple.push(poly);
			continue;
		}
		let joined: ClippedPolygon[] | null;
		try {
			joined = joinHoles(poly, CUT_IN_SLIT_UM);
		} catch {
			joined = null;
		}
		if (!joined) {
			const reason = 'a hole it encloses could not be joined to the outside';
			return { kind: 'refused', at, reason, crossings };
		}
		simple.push(...joined);
	}
	const rings = simple.map((p) => openRing(p[0]));
	const kept = rings.filter((r) => r.length >= 3 && polygonAreaUm2(r) >= MIN_PIECE_AREA_UM2);
	const pieces = kept.map((r) => r.map(([x, y]) => [x / f, y / f] as PointUm));
	return {
		kind: 'repaired',
		at,
		crossed,
		pieces,
		holesJoined,
		dropped: rings.length - kept.length,
		crossings
	};
}
