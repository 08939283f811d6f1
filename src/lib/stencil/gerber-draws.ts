/**
 * Stroked pads: some CAD tools paint paste openings with D01 draws of a small round aperture
 * instead of flashing them. Each draw becomes the polygon its aperture sweeps (a capsule for a
 * round aperture, the hull of the two end rectangles for a rectangular one); touching strokes are
 * united into islands with `polygon-clipping` (Martinez–Rueda–Feito sweep, a well-known union
 * library); an island of pad size becomes a polygon opening marked `drawn`, and line-like islands
 * (a board outline, a long thin stroke) are left out and reported with their lines.
 */
import { unite } from './polygon-union';
import type { ApertureInput, PointUm } from './aperture';
import { convexHull, polygonCentroid, polygonSignedArea } from './polygon';
import { formatCount, StencilBudgetError, type StencilLimits } from './limits';
import type { GerberPoint } from './gerber-types';

/** One D01 outside a region, in file units, with the aperture that draws it. */
export interface GerberDraw {
	/** 1-based line of the D01. */
	line: number;
	seq: number;
	clear: boolean;
	offsets: GerberPoint[];
	start: GerberPoint;
	end: GerberPoint;
	/** The drawing aperture: round (diameter) or rectangular (x, y); null when not strokable. */
	pen: { kind: 'circle'; diameter: number } | { kind: 'rect'; x: number; y: number } | null;
	/** Circular interpolation: raw I/J, direction and quadrant mode (G74 single, G75 multi). */
	arc: { i: number; j: number; dir: 'cw' | 'ccw'; quadrant: 'single' | 'multi' } | null;
}

/**
 * Largest elongation D²/A (D: the island's longest extent, A: its area) of a pad. A rectangle
 * L × W has D²/A = (L² + W²)/(L·W), so 20 is a rectangle about 20 times longer than wide;
 * stroked fine-pitch pads (0.25 × 1.5 mm: 6.2) and long connector pads (0.3 × 4.5 mm: 15) are
 * below it, a board outline or a long thin stroke far above it.
 */
export const MAX_PAD_ELONGATION = 20;

/** Most vertices of one stroke's round end (per half circle), so a wide pen stays cheap. */
const MAX_CAP_VERTICES = 24;

/** Most chords one drawn arc is cut into. */
const MAX_ARC_CHORDS = 64;

/**
 * Most strokes one island may be painted with before it is taken for an area fill, not a pad,
 * and left out without uniting it: a 5 mm thermal pad filled at half a 0.1 mm pen is 100
 * strokes, and uniting 1,000 small capsules takes about a quarter of a second.
 */
export const MAX_STROKES_PER_PAD = 1_000;

/** Most box tests spent finding strokes that touch; past it the layer is refused (budget). */
const MAX_PAIR_TESTS = 5_000_000;

/** An island made by draws: its outline in µm (counter-clockwise) and where it came from. */
export interface DrawnIsland {
	outer: PointUm[];
	holes: number;
	lines: number[];
	areaUm2: number;
	/** Longest extent (hull diameter), µm. */
	extentUm: number;
	/** D²/A; see `MAX_PAD_ELONGATION`. */
	elongation: number;
	lineLike: boolean;
}

/** What the draws of a layer make. */
export interface DrawnResult {
	apertures: ApertureInput[];
	/** First draw line of each opening in `apertures`. */
	apertureLines: number[];
	islands: DrawnIsland[];
	/** Draws whose islands became openings. */
	drawsUsed: number;
	/** Draws left out (line-like islands, clear polarity, aperture that cannot draw). */
	drawsLeftOut: number;
	warnings: { line: number; what: string; message: string }[];
}

/** Vertices of a half circle (or less) of radius r within the chord tolerance. */
function capSegments(r: number, tolUm: number): number {
	if (r <= tolUm) return 2;
	const step = 2 * Math.acos(1 - tolUm / r);
	return Math.max(2, Math.min(MAX_CAP_VERTICES, Math.ceil(Math.PI / step)));
}

/**
 * The polygon a round pen of diameter w sweeps from p to q (a capsule), counter-clockwise,
 * inscribed: its area is at most L·w + πw²/4 and short of it by less than perimeter × tolerance.
 * @example strokeCapsule([0, 0], [1000, 0], 100, 0.5).length // 2 × (segments + 1)
 */
export function strokeCapsule(p: PointUm, q: PointUm, w: number, tolUm: number): PointUm[] {
	const r = w / 2;
	const n = capSegments(r, tolUm);
	if (p[0] === q[0] && p[1] === q[1]) {
		// A draw of zero length leaves the pen's disc.
		return Array.from({ length: 2 * n }, (_, k): PointUm => {
			const t = (Math.PI * k) / n;
			return [p[0] + r * Math.cos(t), p[1] + r * Math.sin(t)];
		});
	}
	const a = Math.atan2(q[1] - p[1], q[0] - p[0]);
	const out: PointUm[] = [];
	// Around q from a − 90° to a + 90°, then around p from a + 90° to a + 270°.
	for (let k = 0; k <= n; k++) {
		const t = a - Math.PI / 2 + (Math.PI * k) / n;
		out.push([q[0] + r * Math.cos(t), q[1] + r * Math.sin(t)]);
	}
	for (let k = 0; k <= n; k++) {
		const t = a + Math.PI / 2 + (Math.PI * k) / n;
		out.push([p[0] + r * Math.cos(t), p[1] + r * Math.sin(t)]);
	}
	return out;
}

/** The polygon a rectangular pen (x × y, axis-aligned) sweeps from p to q: a convex hull. */
export function strokeRectangle(p: PointUm, q: PointUm, x: number, y: number): PointUm[] {
	const corners: PointUm[] = [];
	for (const c of [p, q])
		for (const [sx, sy] of [
			[-1, -1],
			[1, -1],
			[1, 1],
			[-1, 1]
		])
			corners.push([c[0] + (sx * x) / 2, c[1] + (sy * y) / 2]);
	return convexHull(corners);
}

/**
 * Centre of a drawn arc. Multi quadrant (G75): start + (I, J). Single quadrant (G74): I and J
 * are unsigned; of the four sign choices the one whose arc spans at most 90° in the given
 * direction and whose radius at the end fits best (Gerber Layer Format Specification,
 * "Circular interpolation", single-quadrant mode).
 */
export function drawnArcCentre(d: Pick<GerberDraw, 'start' | 'end' | 'arc'>): GerberPoint {
	const arc = d.arc!;
	const [sx, sy] = d.start;
	if (arc.quadrant === 'multi') return [sx + arc.i, sy + arc.j];
	let best: GerberPoint = [sx + arc.i, sy + arc.j];
	let bestMiss = Infinity;
	for (const si of [1, -1])
		for (const sj of [1, -1]) {
			const c: GerberPoint = [sx + si * Math.abs(arc.i), sy + sj * Math.abs(arc.j)];
			const sweep = arcSweep(d.start, d.end, c, arc.dir, false);
			if (Math.abs(sweep) > Math.PI / 2 + 1e-9) continue;
			const miss = Math.abs(
				Math.hypot(sx - c[0], sy - c[1]) - Math.hypot(d.end[0] - c[0], d.end[1] - c[1])
			);
			if (miss < bestMiss) [best, bestMiss] = [c, miss];
		}
	return best;
}

/** Signed sweep (radians, + counter-clockwise) from start to end about c. */
function arcSweep(
	start: GerberPoint,
	end: GerberPoint,
	c: GerberPoint,
	dir: 'cw' | 'ccw',
	fullWhenClosed: boolean
): number {
	const a0 = Math.atan2(start[1] - c[1], start[0] - c[0]);
	const a1 = Math.atan2(end[1] - c[1], end[0] - c[0]);
	let ccw = a1 - a0;
	while (ccw < 0) ccw += 2 * Math.PI;
	while (ccw >= 2 * Math.PI) ccw -= 2 * Math.PI;
	const closed = start[0] === end[0] && start[1] === end[1];
	if (closed) return fullWhenClosed ? (dir === 'ccw' ? 2 * Math.PI : -2 * Math.PI) : 0;
	return dir === 'ccw' ? ccw : ccw - 2 * Math.PI;
}

/** Points of a draw's path in µm: its two ends, or the chord ends of its arc. */
function drawPath(d: GerberDraw, f: number, tolUm: number): PointUm[] {
	const s: PointUm = [d.start[0] * f, d.start[1] * f];
	const e: PointUm = [d.end[0] * f, d.end[1] * f];
	if (!d.arc) return [s, e];
	const c = drawnArcCentre(d);
	const sweep = arcSweep(d.start, d.end, c, d.arc.dir, d.arc.quadrant === 'multi');
	const r = Math.hypot(d.start[0] - c[0], d.start[1] - c[1]) * f;
	if (sweep === 0 || r === 0) return [s, e];
	const step = r > tolUm ? 2 * Math.acos(1 - tolUm / r) : Math.PI / 2;
	const n = Math.max(1, Math.min(MAX_ARC_CHORDS, Math.ceil(Math.abs(sweep) / step)));
	const a0 = Math.atan2(d.start[1] - c[1], d.start[0] - c[0]);
	const pts: PointUm[] = [s];
	for (let k = 1; k < n; k++) {
		const t = a0 + (sweep * k) / n;
		pts.push([c[0] * f + r * Math.cos(t), c[1] * f + r * Math.sin(t)]);
	}
	pts.push(e);
	return pts;
}

/** A stroke piece: its polygon, box and the draw it comes from. */
interface Piece {
	poly: PointUm[];
	box: [number, number, number, number];
	line: number;
}

function boxOf(poly: readonly PointUm[]): [number, number, number, number] {
	let [x0, y0, x1, y1] = [Infinity, Infinity, -Infinity, -Infinity];
	for (const [x, y] of poly) {
		if (x < x0) x0 = x;
		if (y < y0) y0 = y;
		if (x > x1) x1 = x;
		if (y > y1) y1 = y;
	}
	return [x0, y0, x1, y1];
}

/**
 * Groups of pieces whose boxes touch (union-find over a uniform grid of cells about the size of
 * a median piece; a piece is filed in every cell it covers, counted against `maxCells`).
 */
function touchingGroups(pieces: readonly Piece[], maxCells: number): number[][] {
	const parent = pieces.map((_, i) => i);
	const find = (i: number): number => {
		while (parent[i] !== i) i = parent[i] = parent[parent[i]];
		return i;
	};
	const sizes = pieces
		.map((p) => Math.max(p.box[2] - p.box[0], p.box[3] - p.box[1]))
		.sort((a, b) => a - b);
	const cell = Math.max(1, sizes[Math.floor(sizes.length / 2)] ?? 1);
	const cells = new Map<string, number[]>();
	let filed = 0;
	pieces.forEach((p, i) => {
		const [c0, r0] = [Math.floor(p.box[0] / cell), Math.floor(p.box[1] / cell)];
		const [c1, r1] = [Math.floor(p.box[2] / cell), Math.floor(p.box[3] / cell)];
		filed += (c1 - c0 + 1) * (r1 - r0 + 1);
		if (filed > maxCells) {
			throw new StencilBudgetError(
				`the draws cover more than ${formatCount(maxCells)} grid cells; the strokes are too ` +
					'long for their widths to be related to one another'
			);
		}
		for (let r = r0; r <= r1; r++)
			for (let c = c0; c <= c1; c++) {
				const key = `${c},${r}`;
				const list = cells.get(key);
				if (list) list.push(i);
				else cells.set(key, [i]);
			}
	});
	let tests = 0;
	for (const list of cells.values())
		for (let a = 0; a < list.length; a++)
			for (let b = a + 1; b < list.length; b++) {
				if (++tests > MAX_PAIR_TESTS) {
					throw new StencilBudgetError(
						`relating the draws takes more than ${formatCount(MAX_PAIR_TESTS)} tests; ` +
							'too many strokes lie on top of one another'
					);
				}
				const [p, q] = [pieces[list[a]].box, pieces[list[b]].box];
				if (p[0] <= q[2] && q[0] <= p[2] && p[1] <= q[3] && q[1] <= p[3])
					parent[find(list[a])] = find(list[b]);
			}
	const groups = new Map<number, number[]>();
	pieces.forEach((_, i) => {
		const root = find(i);
		const g = groups.get(root);
		if (g) g.push(i);
		else groups.set(root, [i]);
	});
	return [...groups.values()];
}

/** Longest distance between two points of the hull (O(h²); hulls of islands are small). */
function hullDiameter(points: readonly PointUm[]): number {
	const hull = convexHull(points);
	let best = 0;
	for (let i = 0; i < hull.length; i++)
		for (let j = i + 1; j < hull.length; j++)
			best = Math.max(best, Math.hypot(hull[i][0] - hull[j][0], hull[i][1] - hull[j][1]));
	return best;
}

/** A ring from polygon-clipping (closed, first point repeated) as an open vertex list. */
function openRing(ring: readonly [number, number][]): PointUm[] {
	const out = ring.map(([x, y]) => [x, y] as PointUm);
	const [a, b] = [out[0], out[out.length - 1]];
	if (out.length > 1 && a[0] === b[0] && a[1] === b[1]) out.pop();
	return out;
}

/** Short list of lines for a message: `12, 13, 40 and 3 more`. */
export function listLines(lines: readonly number[], max = 8): string {
	const sorted = [...new Set(lines)].sort((a, b) => a - b);
	const head = sorted.slice(0, max).join(', ');
	return sorted.length > max ? `${head} and ${sorted.length - max} more` : head;
}

/**
 * Turn the draws of a layer into openings. `f` converts file units to µm, `tolUm` is the chord
 * tolerance. Work is counted first: every stroke piece (a draw, or a chord of a drawn arc, times
 * its step-and-repeat copies) against `limits.maxDrawSegmentsPerLayer`, and the vertices of the
 * openings against `takeVertices`.
 * @throws {StencilBudgetError} naming the limit when the draws ask for too much work.
 * @example importDraws([capsuleDraw], 1000, 0.5, limits, () => true).apertures[0].drawn // true
 */
export function importDraws(
	draws: readonly GerberDraw[],
	f: number,
	tolUm: number,
	limits: StencilLimits,
	takeVertices: (n: number, line: number) => boolean
): DrawnResult {
	const warnings: DrawnResult['warnings'] = [];
	let drawsLeftOut = 0;
	const pieces: Piece[] = [];
	const clearLines: number[] = [];
	const penless: number[] = [];
	let segments = 0;
	for (const d of draws) {
		if (d.clear) {
			clearLines.push(d.line);
			drawsLeftOut++;
			continue;
		}
		if (!d.pen) {
			penless.push(d.line);
			drawsLeftOut++;
			continue;
		}
		const path = drawPath(d, f, tolUm);
		segments += (path.length - 1) * d.offsets.length;
		if (segments > limits.maxDrawSegmentsPerLayer) {
			throw new StencilBudgetError(
				`line ${d.line}: the draws of the layer make more than ` +
					`${formatCount(limits.maxDrawSegmentsPerLayer)} stroke segments (arcs cut into ` +
					`chords, step-and-repeat copies included); the limit is ` +
					`${formatCount(limits.maxDrawSegmentsPerLayer)} per layer`,
				413
			);
		}
		for (const [ox, oy] of d.offsets)
			for (let k = 0; k + 1 < path.length; k++) {
				const p: PointUm = [path[k][0] + ox * f, path[k][1] + oy * f];
				const q: PointUm = [path[k + 1][0] + ox * f, path[k + 1][1] + oy * f];
				const poly =
					d.pen.kind === 'circle'
						? strokeCapsule(p, q, d.pen.diameter * f, tolUm)
						: strokeRectangle(p, q, d.pen.x * f, d.pen.y * f);
				pieces.push({ poly, box: boxOf(poly), line: d.line });
			}
	}
	if (clearLines.length > 0)
		warnings.push({
			line: clearLines[0],
			what: '%LPC D01',
			message: `${clearLines.length} clear-polarity draw(s) skipped (lines ${listLines(clearLines)})`
		});
	if (penless.length > 0)
		warnings.push({
			line: penless[0],
			what: 'D01',
			message:
				`${penless.length} draw(s) with an aperture that cannot draw (only round and ` +
				`rectangular apertures stroke) skipped (lines ${listLines(penless)})`
		});

	const islands: DrawnIsland[] = [];
	const groups = touchingGroups(pieces, limits.maxDrawSegmentsPerLayer * 64);
	for (const group of groups) {
		const lines = group.map((i) => pieces[i].line);
		if (group.length > MAX_STROKES_PER_PAD) {
			warnings.push({
				line: Math.min(...lines),
				what: 'D01',
				message:
					`${formatCount(group.length)} strokes touch one another at lines ` +
					`${listLines(lines)}: more than ${formatCount(MAX_STROKES_PER_PAD)}, so an area ` +
					'fill, not a pad; skipped'
			});
			continue;
		}
		let polys: [number, number][][][];
		if (group.length === 1) polys = [[pieces[group[0]].poly]];
		else {
			try {
				polys = unite(group.map((i) => pieces[i].poly));
			} catch {
				warnings.push({
					line: Math.min(...lines),
					what: 'D01',
					message:
						`the strokes drawn at lines ${listLines(lines)} could not be united ` +
						'(degenerate geometry); skipped'
				});
				continue;
			}
		}
		for (const rings of polys) {
			const outer = openRing(rings[0]);
			if (outer.length < 3) continue;
			if (polygonSignedArea(outer) < 0) outer.reverse();
			const areaUm2 =
				polygonSignedArea(outer) -
				rings.slice(1).reduce((s, h) => s + Math.abs(polygonSignedArea(openRing(h))), 0);
			const extentUm = hullDiameter(outer);
			const elongation = areaUm2 > 0 ? (extentUm * extentUm) / areaUm2 : Infinity;
			const holes = rings.length - 1;
			const lineLike = holes > 0 || !(elongation <= MAX_PAD_ELONGATION);
			islands.push({ outer, holes, lines, areaUm2, extentUm, elongation, lineLike });
		}
	}

	const apertures: ApertureInput[] = [];
	const apertureLines: number[] = [];
	const usedLines = new Set<number>();
	const leftOutLines = new Set<number>();
	let lineLikeIslands = 0;
	for (const island of islands) {
		if (island.lineLike) {
			lineLikeIslands++;
			island.lines.forEach((l) => leftOutLines.add(l));
			continue;
		}
		if (island.outer.length > limits.maxOutlineVertices) {
			warnings.push({
				line: Math.min(...island.lines),
				what: 'D01',
				message:
					`the island drawn at lines ${listLines(island.lines)} has ` +
					`${formatCount(island.outer.length)} vertices; the limit is ` +
					`${formatCount(limits.maxOutlineVertices)} per outline; skipped`
			});
			island.lines.forEach((l) => leftOutLines.add(l));
			continue;
		}
		if (!takeVertices(island.outer.length, Math.min(...island.lines))) break;
		island.lines.forEach((l) => usedLines.add(l));
		const [cx, cy] = polygonCentroid(island.outer);
		apertureLines.push(Math.min(...island.lines));
		apertures.push({
			refdes: '',
			pad: '',
			shape: 'polygon',
			verticesUm: island.outer.map(([x, y]) => [x - cx, y - cy] as PointUm),
			xUm: cx,
			yUm: cy,
			rotationDeg: 0,
			drawn: true
		});
	}
	// A draw counts as used when any island of its group became an opening.
	const leftOnly = [...leftOutLines].filter((l) => !usedLines.has(l));
	const drawnLeftOut = draws.filter((d) => !d.clear && d.pen && !usedLines.has(d.line)).length;
	drawsLeftOut += drawnLeftOut;
	if (lineLikeIslands > 0)
		warnings.push({
			line: leftOnly.length > 0 ? Math.min(...leftOnly) : Math.min(...leftOutLines),
			what: 'D01',
			message:
				`${drawnLeftOut} draw(s) outside regions skipped: they make ${lineLikeIslands} ` +
				`line-like island(s) (longer than ${MAX_PAD_ELONGATION} times their mean width, or ` +
				`enclosing a hole: an outline or a thin stroke), at lines ${listLines(leftOnly)}`
		});
	return {
		apertures,
		apertureLines,
		islands,
		drawsUsed: draws.length - drawsLeftOut,
		drawsLeftOut,
		warnings
	};
}
