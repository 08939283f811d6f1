import { chartConstants } from './chart-constants';
import type { ChartLimits, ChartPoint, ControlChart, LimitOptions } from './chart-types';
import { SpcInputError } from './spc-input-error';
import { mean, range } from './summary-statistics';
import { baselineIndices, validateSubgroups } from './validate-input';

/** Largest subgroup size for an R chart; beyond it the range wastes information (use S). */
export const XBAR_R_MAX_SUBGROUP_SIZE = 10;
/** Fewest subgroups accepted; 20–25 are recommended for trustworthy Phase I limits. */
export const XBAR_MIN_SUBGROUPS = 2;

/**
 * Points of an X̄/R chart: subgroup mean and range for each subgroup.
 * @throws SpcInputError for non-numbers, mixed sizes, size < 2 or > 10, < 2 subgroups.
 * @example xbarRPoints([[1, 3], [2, 2]]) // [{ location: 2, dispersion: 2, size: 2 }, …]
 */
export function xbarRPoints(subgroups: unknown): ChartPoint[] {
	const groups = validateSubgroups(subgroups, 'subgroups', {
		chartName: 'X-bar/R',
		minSubgroups: XBAR_MIN_SUBGROUPS,
		minSize: 2,
		maxSize: XBAR_R_MAX_SUBGROUP_SIZE,
		tooSmallHint: "use chart 'i-mr' for single values",
		tooLargeHint: "use chart 'xbar-s' for subgroups larger than 10"
	});
	return groups.map((g) => ({ location: mean(g), dispersion: range(g), size: g.length }));
}

/**
 * X̄/R limits from the baseline points (Phase I): X̄ chart x̿ ± A2·R̄, R chart D3·R̄..D4·R̄,
 * σ̂ within = R̄/d2. Reference: Montgomery, ISQC §6.2; AIAG SPC manual constants table.
 * @throws SpcInputError when `exclude` is out of range or leaves < 2 points.
 * @example xbarRLimits(xbarRPoints(data), { exclude: [4] })
 */
export function xbarRLimits(
	points: readonly ChartPoint[],
	options: LimitOptions = {}
): ChartLimits {
	const n = commonSize(points);
	const k = chartConstants(n);
	const kept = baselineIndices(points.length, options.exclude, XBAR_MIN_SUBGROUPS);
	const grandMean = mean(kept.map((i) => points[i].location));
	const meanRange = mean(kept.map((i) => points[i].dispersion ?? 0));
	return {
		kind: 'xbar-r',
		subgroupSize: n,
		location: {
			lcl: grandMean - k.A2 * meanRange,
			cl: grandMean,
			ucl: grandMean + k.A2 * meanRange
		},
		dispersion: { lcl: k.D3 * meanRange, cl: meanRange, ucl: k.D4 * meanRange },
		sigmaWithin: meanRange / k.d2,
		dispersionLclClipped: 1 - (3 * k.d3) / k.d2 < 0,
		baselineIndices: kept
	};
}

/**
 * Build an X̄/R chart: points plus limits from all (or the non-excluded) subgroups.
 * @throws SpcInputError as `xbarRPoints` and `xbarRLimits`.
 * @example xbarRChart([[1, 2, 3], [2, 3, 4]]).limits.location.cl // 2.5
 */
export function xbarRChart(subgroups: unknown, options: LimitOptions = {}): ControlChart {
	const points = xbarRPoints(subgroups);
	return { points, limits: xbarRLimits(points, options) };
}

/**
 * Subgroup size shared by all points; charts with fixed-size constants need it equal.
 * @throws SpcInputError for no points or a point of another size.
 * @example commonSize(xbarRPoints([[1, 2], [3, 4]])) // 2
 */
export function commonSize(points: readonly ChartPoint[]): number {
	if (points.length === 0) throw new SpcInputError('points', 'is empty');
	const n = points[0].size;
	points.forEach((p, i) => {
		if (p.size !== n) {
			throw new SpcInputError(`points[${i}]`, `has size ${p.size} but point 0 has ${n}`);
		}
	});
	return n;
}
