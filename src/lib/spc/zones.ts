import type { ControlLimits } from './chart-types';

/**
 * Zone boundaries of one chart: `upper[k]` / `lower[k]` is the k-sigma line (k = 1, 2, 3)
 * above / below the centre line; `upper[3]` is exactly the UCL and `lower[3]` the LCL.
 */
export interface ZoneBoundaries {
	cl: number;
	upper: [number, number, number, number];
	lower: [number, number, number, number];
}

/**
 * Zone lines from the chart's own limits (Western Electric Handbook, 1956: zones are 1σ
 * bands of the plotted statistic). Upper σ = (UCL − CL)/3, lower σ = (CL − LCL)/3, so
 * asymmetric limits are handled per side. When the LCL was clipped to 0 (R, S, MR charts),
 * the lower σ is taken from the upper side, and the lower 3σ line stays at the clipped LCL.
 * @example zoneBoundaries({ lcl: 7, cl: 10, ucl: 13 }).upper // [10, 11, 12, 13]
 */
export function zoneBoundaries(limits: ControlLimits, lclClipped = false): ZoneBoundaries {
	const { lcl, cl, ucl } = limits;
	const sigmaUp = (ucl - cl) / 3;
	const sigmaDown = lclClipped ? sigmaUp : (cl - lcl) / 3;
	return {
		cl,
		upper: [cl, cl + sigmaUp, cl + 2 * sigmaUp, ucl],
		lower: [cl, cl - sigmaDown, cl - 2 * sigmaDown, lcl]
	};
}

/**
 * Where one value sits: `side` +1 above the centre line, −1 below, 0 exactly on it (or not
 * a finite number); `level` = how many of its side's 1σ, 2σ, 3σ lines it is strictly beyond
 * (0 = Zone C, 1 = Zone B, 2 = Zone A, 3 = beyond the control limit).
 * A value exactly on a line is not beyond it.
 * @example zonePosition(12, zoneBoundaries({ lcl: 7, cl: 10, ucl: 13 })) // { side: 1, level: 1 }
 */
export function zonePosition(
	value: number,
	zones: ZoneBoundaries
): { side: -1 | 0 | 1; level: 0 | 1 | 2 | 3 } {
	if (!Number.isFinite(value) || value === zones.cl) return { side: 0, level: 0 };
	if (value > zones.cl) {
		const u = zones.upper;
		return { side: 1, level: value > u[3] ? 3 : value > u[2] ? 2 : value > u[1] ? 1 : 0 };
	}
	const d = zones.lower;
	return { side: -1, level: value < d[3] ? 3 : value < d[2] ? 2 : value < d[1] ? 1 : 0 };
}
