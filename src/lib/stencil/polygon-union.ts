/**
 * Boolean operations on polygons with `polygon-clipping` 0.15 (Martinez–Rueda–Feito sweep, a
 * well-known general-purpose library), made robust for Rollbead's use: its sweep can trip over
 * float noise (a vertex at −6e-16), so vertices are snapped to a 1 nm grid first, and to 10 nm,
 * then 100 nm if it still fails: far below the 0.5 µm chord tolerance, so areas do not move.
 */
import polygonClipping from 'polygon-clipping';
import type { PointUm } from './aperture';
import { polygonSignedArea } from './polygon';

/** A polygon with holes as polygon-clipping returns it: rings closed (first point repeated). */
export type ClippedPolygon = [number, number][][];

function withSnapping<T>(polys: readonly PointUm[][], run: (geoms: ClippedPolygon[]) => T): T {
	let last: unknown;
	for (const grid of [1e-3, 1e-2, 1e-1]) {
		const snap = (v: number) => Math.round(v / grid) * grid;
		const geoms = polys.map((p) => [p.map(([x, y]) => [snap(x), snap(y)] as [number, number])]);
		try {
			return run(geoms);
		} catch (e) {
			last = e;
		}
	}
	throw last;
}

/**
 * Union of simple polygons (µm), as a list of polygons with holes.
 * @throws when the library fails at every snapping grid (degenerate input).
 * @example unite([[[0,0],[2,0],[2,1],[0,1]], [[1,0],[3,0],[3,1],[1,1]]]).length // 1
 */
export function unite(polys: readonly PointUm[][]): ClippedPolygon[] {
	return withSnapping(polys, (g) => polygonClipping.union(g[0], ...g.slice(1)) as ClippedPolygon[]);
}

/**
 * Intersection of two simple polygons (µm), as a list of polygons with holes.
 * @example clippedArea(intersect([[0,0],[2,0],[2,2],[0,2]], [[1,1],[3,1],[3,3],[1,3]])) // 1
 */
export function intersect(a: readonly PointUm[], b: readonly PointUm[]): ClippedPolygon[] {
	return withSnapping(
		[a as PointUm[], b as PointUm[]],
		(g) => polygonClipping.intersection(g[0], g[1]) as ClippedPolygon[]
	);
}

/** Area of polygons with holes: outer rings minus holes, µm². */
export function clippedArea(polys: readonly ClippedPolygon[]): number {
	let sum = 0;
	for (const rings of polys)
		rings.forEach((ring, k) => {
			const a = Math.abs(polygonSignedArea(ring as PointUm[]));
			sum += k === 0 ? a : -a;
		});
	return sum;
}

/**
 * What is left of `pieces` (simple polygons, one shape) after cutting `cut` out of it.
 * @example clippedArea(subtract([[[0,0],[2,0],[2,2],[0,2]]], [[1,0],[3,0],[3,2],[1,2]])) // 2
 */
export function subtract(pieces: readonly PointUm[][], cut: readonly PointUm[]): ClippedPolygon[] {
	return withSnapping([...pieces, cut as PointUm[]], (g) => {
		const subject = g.slice(0, -1);
		return polygonClipping.difference(subject as never, g[g.length - 1]) as ClippedPolygon[];
	});
}

/** A ring from polygon-clipping (closed, first point repeated) as an open vertex list. */
export function openRing(ring: readonly [number, number][]): PointUm[] {
	const out = ring.map(([x, y]) => [x, y] as PointUm);
	const [a, b] = [out[0], out[out.length - 1]];
	if (out.length > 1 && a[0] === b[0] && a[1] === b[1]) out.pop();
	return out;
}
