/**
 * Overlapping openings: two apertures whose outlines share area print one deposit, and the
 * stencil's paste area counts the shared part twice. Candidate pairs come from a uniform grid of
 * bounding boxes (each pair tested once, work counted); each candidate is confirmed by
 * intersecting the outlines, and each group of overlapping apertures is united, both with
 * `polygon-clipping` (see `polygon-union.ts`).
 */
import type { ApertureInput, PointUm } from './aperture';
import { validApertureBoundsUm, validApertureOutlineUm } from './outline';
import { polygonAreaUm2 } from './polygon';
import { clippedArea, intersect, unite } from './polygon-union';
import { formatCount, RELATIVE_TOLERANCE } from './limits';

/** Two apertures (indices into the list, a < b) and the area they share, µm². */
export interface ApertureOverlap {
	a: number;
	b: number;
	areaUm2: number;
}

/** What `findApertureOverlaps` found. */
export interface OverlapReport {
	pairs: ApertureOverlap[];
	/** Sum of the apertures' own areas, µm² (shared parts counted once per aperture). */
	sumAreaUm2: number;
	/** Area of their union, µm² (shared parts counted once). */
	unionAreaUm2: number;
	/** False when a work budget stopped the check; `note` says where. */
	complete: boolean;
	note?: string;
}

/** Budgets of the overlap check. */
export interface OverlapLimits {
	/** Box-pair tests; past it the check stops (incomplete). */
	maxPairTests: number;
	/** Grid cells filed, all boxes together; past it the check stops. */
	maxCellsFiled: number;
	/** Confirmed pairs kept; past it the check stops. */
	maxPairs: number;
	/** Apertures in one overlapping group that are united; a larger group is not united. */
	maxGroupSize: number;
}

export const DEFAULT_OVERLAP_LIMITS: Readonly<OverlapLimits> = Object.freeze({
	maxPairTests: 2_000_000,
	maxCellsFiled: 1_000_000,
	maxPairs: 10_000,
	maxGroupSize: 500
});

/** Chords per quarter circle of the outlines compared (16 chords a quarter: a circle's outline is 0.16 % short of its area). */
const SEGMENTS_PER_QUARTER = 16;

/**
 * Find the apertures that overlap (share area; touching edges do not count) and the union area.
 * `areasUm2[i]` is aperture i's exact area (from `apertureGeometry`); the union is that sum less
 * what each overlapping group shares, measured on the chord outlines, so a stencil without
 * overlaps gets exactly the sum. Apertures must be valid (stored ones are).
 * @example findApertureOverlaps([rect(1000, 1000), rect(1000, 1000, { xUm: 500 })], [1e6, 1e6])
 * // { pairs: [{ a: 0, b: 1, areaUm2: 500000 }], sumAreaUm2: 2e6, unionAreaUm2: 1.5e6, complete: true }
 */
export function findApertureOverlaps(
	apertures: readonly ApertureInput[],
	areasUm2: readonly number[],
	limits: OverlapLimits = DEFAULT_OVERLAP_LIMITS
): OverlapReport {
	const n = apertures.length;
	const sumAreaUm2 = areasUm2.reduce((s, a) => s + a, 0);
	const done = (pairs: ApertureOverlap[], unionAreaUm2: number, note?: string): OverlapReport =>
		note === undefined
			? { pairs, sumAreaUm2, unionAreaUm2, complete: true }
			: { pairs, sumAreaUm2, unionAreaUm2, complete: false, note };
	if (n < 2) return done([], sumAreaUm2);
	const boxes = apertures.map((a) => {
		const b = validApertureBoundsUm(a);
		return [b.xMinUm, b.yMinUm, b.xMaxUm, b.yMaxUm];
	});
	const sizes = boxes.map((b) => Math.max(b[2] - b[0], b[3] - b[1])).sort((p, q) => p - q);
	const cell = Math.max(1, sizes[Math.floor(n / 2)]);
	// Numeric cell keys (column and row offset into 2^26 each): string keys cost half the time.
	const OFF = 2 ** 25;
	const keyOf = (c: number, r: number) => (c + OFF) * 2 ** 26 + (r + OFF);
	const cells = new Map<number, number[]>();
	let filed = 0;
	for (let i = 0; i < n; i++) {
		const [c0, r0, c1, r1] = boxes[i].map((v) => Math.floor(v / cell));
		filed += (c1 - c0 + 1) * (r1 - r0 + 1);
		if (filed > limits.maxCellsFiled)
			return done(
				[],
				sumAreaUm2,
				`overlap check stopped: the openings cover more than ${formatCount(limits.maxCellsFiled)} grid cells`
			);
		for (let r = r0; r <= r1; r++)
			for (let c = c0; c <= c1; c++) {
				const key = keyOf(c, r);
				const list = cells.get(key);
				if (list) list.push(i);
				else cells.set(key, [i]);
			}
	}
	const outlines = new Map<number, PointUm[]>();
	const outline = (i: number) => {
		let o = outlines.get(i);
		if (!o) outlines.set(i, (o = validApertureOutlineUm(apertures[i], SEGMENTS_PER_QUARTER)));
		return o;
	};
	const pairs: ApertureOverlap[] = [];
	let tests = 0;
	let note: string | undefined;
	scan: for (const [key, list] of cells) {
		const [c, r] = [Math.floor(key / 2 ** 26) - OFF, (key % 2 ** 26) - OFF];
		for (let p = 0; p < list.length; p++)
			for (let q = p + 1; q < list.length; q++) {
				if (++tests > limits.maxPairTests) {
					note = `overlap check stopped after ${formatCount(limits.maxPairTests)} box tests (openings piled on one spot)`;
					break scan;
				}
				const [i, j] = list[p] < list[q] ? [list[p], list[q]] : [list[q], list[p]];
				const [a, b] = [boxes[i], boxes[j]];
				if (!(a[0] < b[2] && b[0] < a[2] && a[1] < b[3] && b[1] < a[3])) continue;
				// Test each pair only in the cell holding the corner where the two boxes start.
				const [cx, cy] = [Math.max(a[0], b[0]), Math.max(a[1], b[1])].map((v) =>
					Math.floor(v / cell)
				);
				if (cx !== c || cy !== r) continue;
				let shared: number;
				try {
					shared = clippedArea(intersect(outline(i), outline(j)));
				} catch {
					continue;
				}
				if (shared > RELATIVE_TOLERANCE * Math.min(areasUm2[i], areasUm2[j])) {
					pairs.push({ a: i, b: j, areaUm2: shared });
					if (pairs.length >= limits.maxPairs) {
						note = `overlap check stopped after ${formatCount(limits.maxPairs)} overlapping pairs`;
						break scan;
					}
				}
			}
	}
	pairs.sort((p, q) => p.a - q.a || p.b - q.b);
	// Groups of overlapping apertures (union-find), each united once.
	const parent = new Map<number, number>();
	const find = (i: number): number => {
		let root = i;
		while (parent.has(root) && parent.get(root) !== root) root = parent.get(root)!;
		parent.set(i, root);
		return root;
	};
	for (const { a, b } of pairs) {
		if (!parent.has(a)) parent.set(a, a);
		if (!parent.has(b)) parent.set(b, b);
		parent.set(find(a), find(b));
	}
	const groups = new Map<number, number[]>();
	for (const i of parent.keys()) {
		const root = find(i);
		const g = groups.get(root);
		if (g) g.push(i);
		else groups.set(root, [i]);
	}
	const sharedBy = new Map<number, number>();
	for (const { a, b, areaUm2 } of pairs) {
		sharedBy.set(a, (sharedBy.get(a) ?? 0) + areaUm2);
		sharedBy.set(b, (sharedBy.get(b) ?? 0) + areaUm2);
	}
	let unionAreaUm2 = sumAreaUm2;
	for (const group of groups.values()) {
		if (group.length > limits.maxGroupSize) {
			note ??= `${group.length} openings overlap in one group; more than ${limits.maxGroupSize}, so not united`;
			continue;
		}
		const polys = group.map(outline);
		try {
			// Union of the chord outlines, plus each aperture's chord shortfall (exact − outline)
			// on the part of it no other aperture covers, so a circle inside a square adds nothing.
			let unionUm2 = clippedArea(unite(polys));
			group.forEach((i, k) => {
				const own = polygonAreaUm2(polys[k]);
				const covered = Math.min(own, sharedBy.get(i) ?? 0);
				unionUm2 += (areasUm2[i] - own) * (own > 0 ? 1 - covered / own : 0);
			});
			unionAreaUm2 -= group.reduce((s, i) => s + areasUm2[i], 0) - unionUm2;
		} catch {
			note ??= 'a group of overlapping openings could not be united (degenerate outlines)';
		}
	}
	return done(pairs, unionAreaUm2, note);
}

/**
 * Whether polygon `inner` lies wholly inside `outer` (their intersection is all of `inner`,
 * to a relative 1e-6 of its area).
 * @example liesWithin(square(1), square(3)) // true
 */
export function liesWithin(inner: readonly PointUm[], outer: readonly PointUm[]): boolean {
	const own = polygonAreaUm2(inner);
	try {
		return Math.abs(clippedArea(intersect(inner, outer)) - own) <= RELATIVE_TOLERANCE * own;
	} catch {
		return false;
	}
}
