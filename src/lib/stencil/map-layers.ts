/**
 * The aperture map's drawing layers: one SVG path per status holding every outline of that status
 * as subpaths, so a 20,000-aperture stencil is two DOM elements rather than 20,000. Built once per
 * data change; zoom and pan only move the viewBox.
 */
import type { ApertureInput } from './aperture';
import { checkAperture } from './aperture-validation';
import { validApertureBoundsUm, validApertureSvgPath, type BoundsUm } from './outline';

/** The server checked every outline for crossings; the map only needs drawable numbers. */
const MAP_CHECK = { outlineCrossing: false };

/** An aperture as the map needs it: its outline and its verdict. */
export type MapAperture = ApertureInput & { status: 'pass' | 'fail' };

/** What the map draws: the two status paths, their counts and the drawn extent. */
export interface MapLayers {
	/** SVG path data of every passing outline (µm, y up), subpaths concatenated. */
	passPath: string;
	/** SVG path data of every failing outline. */
	failPath: string;
	passCount: number;
	failCount: number;
	/** List indices of apertures that could not be drawn (invalid; the table shows why). */
	skipped: number[];
	/** Bounding box of everything drawn; null when nothing could be drawn. */
	boundsUm: BoundsUm | null;
}

/**
 * Build the map's status paths. Every outline is counter-clockwise (rectangles, arcs and
 * polygons alike), so overlapping openings stay filled under the default non-zero fill rule.
 * O(n) in the number of apertures.
 * @example mapLayers([{ ...pad, status: 'fail' }]).failCount // 1
 */
export function mapLayers(apertures: readonly MapAperture[]): MapLayers {
	const pass: string[] = [];
	const fail: string[] = [];
	const skipped: number[] = [];
	let xMinUm = Infinity;
	let yMinUm = Infinity;
	let xMaxUm = -Infinity;
	let yMaxUm = -Infinity;
	apertures.forEach((a, i) => {
		if (checkAperture(a, undefined, undefined, MAP_CHECK).length > 0) {
			skipped.push(i);
			return;
		}
		const d = validApertureSvgPath(a);
		const b = validApertureBoundsUm(a);
		(a.status === 'fail' ? fail : pass).push(d);
		if (b.xMinUm < xMinUm) xMinUm = b.xMinUm;
		if (b.yMinUm < yMinUm) yMinUm = b.yMinUm;
		if (b.xMaxUm > xMaxUm) xMaxUm = b.xMaxUm;
		if (b.yMaxUm > yMaxUm) yMaxUm = b.yMaxUm;
	});
	return {
		passPath: pass.join(''),
		failPath: fail.join(''),
		passCount: pass.length,
		failCount: fail.length,
		skipped,
		boundsUm: Number.isFinite(xMinUm) ? { xMinUm, yMinUm, xMaxUm, yMaxUm } : null
	};
}
