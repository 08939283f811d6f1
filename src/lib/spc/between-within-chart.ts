import { chartConstants } from './chart-constants';
import type { ChartLimits, ChartPoint, ControlChart, LimitOptions } from './chart-types';
import { baselineMovingRangeMean } from './individuals-chart';
import { SpcInputError } from './spc-input-error';
import { mean, range, sampleStandardDeviation } from './summary-statistics';
import { validateSubgroups } from './validate-input';
import { xbarRLimits, XBAR_MIN_SUBGROUPS, XBAR_R_MAX_SUBGROUP_SIZE } from './xbar-r-chart';
import { xbarSLimits } from './xbar-s-chart';

/**
 * Points of a between/within (three-way) chart: subgroup means with the moving range of
 * consecutive means, plus the within-subgroup range (n ≤ 10) or standard deviation (n > 10).
 *
 * Used for large subgroups (e.g. all deposits of one board from an SPI export), where
 * X̄ limits from within-subgroup spread are far too tight because board-to-board variation
 * is real and expected. Subgroups must share one size ≥ 2; at least 2 subgroups.
 * @throws SpcInputError naming `subgroups`, `subgroups[i]` (e.g. the first subgroup whose size
 * differs from subgroup 0) or `subgroups[i][j]`.
 * @example betweenWithinPoints(boards)[1].movingRange // |x̄₁ − x̄₀|
 */
export function betweenWithinPoints(subgroups: unknown): ChartPoint[] {
	const groups = validateSubgroups(subgroups, 'subgroups', {
		chartName: 'between/within',
		minSubgroups: XBAR_MIN_SUBGROUPS,
		minSize: 2,
		tooSmallHint: "use chart 'i-mr' for single values"
	});
	const large = groups[0].length > XBAR_R_MAX_SUBGROUP_SIZE;
	const means = groups.map(mean);
	return groups.map((g, i) => ({
		location: means[i],
		dispersion: large ? sampleStandardDeviation(g) : range(g),
		size: g.length,
		movingRange: i === 0 ? null : Math.abs(means[i] - means[i - 1])
	}));
}

/**
 * Between/within limits: location = individuals chart of the subgroup means,
 * x̿ ± 3·MR̄/d2(2); moving-range chart 0..D4(2)·MR̄; dispersion = R chart (n ≤ 10) or
 * S chart (n > 10) of the within-subgroup spread; σ̂ within from R̄/d2 or s̄/c4.
 * Reference: Wheeler, Understanding Statistical Process Control (three-way charts; from
 * memory); the component formulas are the standard I-MR and X̄/R, X̄/S ones.
 * @throws SpcInputError when `exclude` is out of range or leaves no adjacent pair.
 * @example betweenWithinLimits(betweenWithinPoints(boards)).movingRange?.ucl
 */
export function betweenWithinLimits(
	points: readonly ChartPoint[],
	options: LimitOptions = {}
): ChartLimits {
	const large = points[0]?.size > XBAR_R_MAX_SUBGROUP_SIZE;
	const within = large ? xbarSLimits(points, options) : xbarRLimits(points, options);
	const k2 = chartConstants(2);
	const mr = baselineMovingRangeMean(
		points.map((p) => p.location),
		within.baselineIndices
	);
	if (mr.count === 0) {
		throw new SpcInputError(
			'exclude',
			'leaves no two consecutive baseline subgroups, so no moving range can be formed'
		);
	}
	const cl = within.location.cl;
	const spread = (3 * mr.mean) / k2.d2;
	return {
		...within,
		kind: 'between-within',
		location: { lcl: cl - spread, cl, ucl: cl + spread },
		movingRange: { lcl: 0, cl: mr.mean, ucl: k2.D4 * mr.mean }
	};
}

/**
 * Build a between/within chart.
 * @throws SpcInputError as `betweenWithinPoints` and `betweenWithinLimits`.
 * @example betweenWithinChart(boards).limits.location
 */
export function betweenWithinChart(subgroups: unknown, options: LimitOptions = {}): ControlChart {
	const points = betweenWithinPoints(subgroups);
	return { points, limits: betweenWithinLimits(points, options) };
}
