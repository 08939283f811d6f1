import { zoneBoundaries, type ControlLimits } from '$lib/spc';

/**
 * The value range a control chart shows: every finite point and the three limit lines, widened
 * by 8 % each side (by 1 when all coincide, so a flat chart still has height).
 * @example valueDomain([10], { lcl: 7, cl: 10, ucl: 13 }) // [6.52, 13.48]
 */
export function valueDomain(finite: readonly number[], limits: ControlLimits): [number, number] {
	const all = [...finite, limits.lcl, limits.ucl, limits.cl];
	let lo = Math.min(...all);
	let hi = Math.max(...all);
	if (!(hi > lo)) {
		lo -= 1;
		hi += 1;
	}
	const pad = (hi - lo) * 0.08;
	return [lo - pad, hi + pad];
}

/** One shaded zone of a control chart, from one 1σ line to the next. */
export interface ZoneBand {
	name: 'A' | 'B' | 'C';
	from: number;
	to: number;
	/** Fill classes: zone A darkest, so the eye finds points near the limits. */
	cls: string;
}

const ZONE_A = 'fill-flux-300/25 dark:fill-flux-700/25';
const ZONE_B = 'fill-flux-100/40 dark:fill-flux-900/30';
const ZONE_C = 'fill-bead-100/40 dark:fill-bead-900/30';

/** The six zone bands (A, B, C above the centre line, then C, B, A below), top to bottom. */
export function zoneBands(limits: ControlLimits, lclClipped: boolean): ZoneBand[] {
	const { upper, lower } = zoneBoundaries(limits, lclClipped);
	return [
		{ name: 'A', from: upper[2], to: upper[3], cls: ZONE_A },
		{ name: 'B', from: upper[1], to: upper[2], cls: ZONE_B },
		{ name: 'C', from: upper[0], to: upper[1], cls: ZONE_C },
		{ name: 'C', from: lower[1], to: lower[0], cls: ZONE_C },
		{ name: 'B', from: lower[2], to: lower[1], cls: ZONE_B },
		{ name: 'A', from: lower[3], to: lower[2], cls: ZONE_A }
	];
}

/**
 * SVG path data through the points in order, lifting the pen at a missing value so a gap is
 * not bridged. Coordinates to 0.1 px.
 * @example linePath([1, null, 3], (i) => i, (v) => v) // 'M0.0,1.0M2.0,3.0'
 */
export function linePath(
	values: readonly (number | null | undefined)[],
	x: (index: number) => number,
	y: (value: number) => number
): string {
	let d = '';
	let pen = false;
	values.forEach((v, i) => {
		if (typeof v !== 'number' || !Number.isFinite(v)) {
			pen = false;
			return;
		}
		d += `${pen ? 'L' : 'M'}${x(i).toFixed(1)},${y(v).toFixed(1)}`;
		pen = true;
	});
	return d;
}
