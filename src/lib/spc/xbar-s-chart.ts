import type { ChartLimits, ChartPoint, ControlChart, LimitOptions } from './chart-types';
import { standardDeviationFactors } from './chart-constants';
import { mean, sampleStandardDeviation } from './summary-statistics';
import { baselineIndices, validateSubgroups } from './validate-input';
import { commonSize, XBAR_MIN_SUBGROUPS } from './xbar-r-chart';

/**
 * Points of an X̄/S chart: subgroup mean and sample standard deviation (ddof 1).
 * Any equal subgroup size ≥ 2. Mixed sizes are refused (s̄-weighted limits that vary with
 * nᵢ are not implemented), naming the first subgroup whose size differs.
 * @throws SpcInputError for non-numbers, mixed sizes, size < 2, < 2 subgroups.
 * @example xbarSPoints([[1, 3], [2, 2]])[0].dispersion // √2
 */
export function xbarSPoints(subgroups: unknown): ChartPoint[] {
	const groups = validateSubgroups(subgroups, 'subgroups', {
		chartName: 'X-bar/S',
		minSubgroups: XBAR_MIN_SUBGROUPS,
		minSize: 2,
		tooSmallHint: "use chart 'i-mr' for single values"
	});
	return groups.map((g) => ({
		location: mean(g),
		dispersion: sampleStandardDeviation(g),
		size: g.length
	}));
}

/**
 * X̄/S limits (Phase I): X̄ chart x̿ ± A3·s̄, S chart B3·s̄..B4·s̄, σ̂ within = s̄/c4,
 * with s̄ the plain average of subgroup standard deviations.
 * Reference: Montgomery, ISQC §6.3; AIAG SPC manual constants table.
 * @throws SpcInputError when `exclude` is out of range or leaves < 2 points.
 * @example xbarSLimits(xbarSPoints(data)).dispersion.ucl
 */
export function xbarSLimits(
	points: readonly ChartPoint[],
	options: LimitOptions = {}
): ChartLimits {
	const n = commonSize(points);
	const f = standardDeviationFactors(n);
	const kept = baselineIndices(points.length, options.exclude, XBAR_MIN_SUBGROUPS);
	const grandMean = mean(kept.map((i) => points[i].location));
	const meanSd = mean(kept.map((i) => points[i].dispersion ?? 0));
	return {
		kind: 'xbar-s',
		subgroupSize: n,
		location: { lcl: grandMean - f.A3 * meanSd, cl: grandMean, ucl: grandMean + f.A3 * meanSd },
		dispersion: { lcl: f.B3 * meanSd, cl: meanSd, ucl: f.B4 * meanSd },
		sigmaWithin: meanSd / f.c4,
		dispersionLclClipped: 1 - (3 * Math.sqrt(1 - f.c4 * f.c4)) / f.c4 < 0,
		baselineIndices: kept
	};
}

/**
 * Build an X̄/S chart: points plus limits.
 * @throws SpcInputError as `xbarSPoints` and `xbarSLimits`.
 * @example xbarSChart(subgroups, { exclude: [3] })
 */
export function xbarSChart(subgroups: unknown, options: LimitOptions = {}): ControlChart {
	const points = xbarSPoints(subgroups);
	return { points, limits: xbarSLimits(points, options) };
}
