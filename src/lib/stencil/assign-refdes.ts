/**
 * Name Gerber apertures (which only have positions) after the nearest component centroid.
 */
import type { ApertureInput } from './aperture';
import type { ComponentCentroid } from './centroid-csv';
import { apertureCentreUm } from './outline';
import { StencilInputError } from './stencil-input-error';
import { formatCount, StencilBudgetError } from './limits';

/** Most aperture-to-centroid distance tests one assignment may make (about a second of work). */
export const MAX_CENTROID_DISTANCE_TESTS = 20_000_000;

/** Result of `assignRefdesFromCentroids`. */
export interface RefdesAssignment {
	/** New aperture list, same order as the input; assigned ones have new refdes and pad. */
	apertures: ApertureInput[];
	/** Indices of apertures with no centroid within the radius (left unchanged). */
	unassigned: number[];
}

/**
 * Give each aperture the refdes of the nearest component centroid within `maxDistanceUm` of
 * the aperture centre, then number the pads of each component 1, 2, 3… in a stable order:
 * top to bottom (y descending), then left to right (x ascending), positions compared at 1 µm
 * resolution, so the numbering does not depend on the Gerber file's order. Ties in distance go
 * to the centroid listed first. O(n) via a grid of cell size `maxDistanceUm`.
 * @throws {StencilInputError} when `maxDistanceUm` is not finite and > 0, or an aperture is invalid.
 * @example assignRefdesFromCentroids(gerberApertures, [{ refdes: 'R1', xUm: 0, yUm: 0 }], 1500)
 */
export function assignRefdesFromCentroids(
	apertures: readonly ApertureInput[],
	centroids: readonly ComponentCentroid[],
	maxDistanceUm: number,
	maxDistanceTests = MAX_CENTROID_DISTANCE_TESTS
): RefdesAssignment {
	if (!Number.isFinite(maxDistanceUm) || maxDistanceUm <= 0)
		throw new StencilInputError([
			{
				where: 'refdes assignment',
				field: 'maxDistanceUm',
				message: `must be a finite number greater than 0 (got ${maxDistanceUm})`
			}
		]);
	const cell = maxDistanceUm;
	const grid = new Map<string, number[]>();
	centroids.forEach((c, i) => {
		const key = `${Math.floor(c.xUm / cell)},${Math.floor(c.yUm / cell)}`;
		const list = grid.get(key);
		if (list) list.push(i);
		else grid.set(key, [i]);
	});
	const centres = apertures.map((a) => apertureCentreUm(a));
	// Components piled within one radius make every aperture measure all of them: count the
	// distance tests first and refuse before making them.
	let pairs = 0;
	for (const [x, y] of centres) {
		const gx = Math.floor(x / cell);
		const gy = Math.floor(y / cell);
		for (let dx = -1; dx <= 1; dx++)
			for (let dy = -1; dy <= 1; dy++) pairs += grid.get(`${gx + dx},${gy + dy}`)?.length ?? 0;
	}
	if (pairs > maxDistanceTests)
		throw new StencilBudgetError(
			`naming the apertures from the centroid file needs ${formatCount(pairs)} distance tests ` +
				`(components piled within ${maxDistanceUm} µm of each other); ` +
				`the limit is ${formatCount(maxDistanceTests)}`,
			413
		);
	const owner: (number | null)[] = centres.map(([x, y]) => {
		const gx = Math.floor(x / cell);
		const gy = Math.floor(y / cell);
		let best: number | null = null;
		let bestD = Infinity;
		for (let dx = -1; dx <= 1; dx++)
			for (let dy = -1; dy <= 1; dy++)
				for (const i of grid.get(`${gx + dx},${gy + dy}`) ?? []) {
					const d = Math.hypot(centroids[i].xUm - x, centroids[i].yUm - y);
					if (d <= maxDistanceUm && (d < bestD || (d === bestD && best !== null && i < best))) {
						best = i;
						bestD = d;
					}
				}
		return best;
	});
	const byComponent = new Map<number, number[]>();
	owner.forEach((c, i) => {
		if (c === null) return;
		const list = byComponent.get(c);
		if (list) list.push(i);
		else byComponent.set(c, [i]);
	});
	const padOf = new Map<number, string>();
	for (const list of byComponent.values()) {
		const sorted = [...list].sort(
			(a, b) =>
				Math.round(centres[b][1]) - Math.round(centres[a][1]) ||
				Math.round(centres[a][0]) - Math.round(centres[b][0]) ||
				a - b
		);
		sorted.forEach((i, k) => padOf.set(i, String(k + 1)));
	}
	const unassigned: number[] = [];
	const out = apertures.map((a, i) => {
		const c = owner[i];
		if (c === null) {
			unassigned.push(i);
			return { ...a };
		}
		return { ...a, refdes: centroids[c].refdes, pad: padOf.get(i)! };
	});
	return { apertures: out, unassigned };
}
