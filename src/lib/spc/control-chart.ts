import { betweenWithinLimits, betweenWithinPoints } from './between-within-chart';
import type { ChartKind, ChartLimits, ChartPoint, ControlChart, LimitOptions } from './chart-types';
import { individualsLimits, individualsPoints } from './individuals-chart';
import { xbarRLimits, xbarRPoints } from './xbar-r-chart';
import { xbarSLimits, xbarSPoints } from './xbar-s-chart';

/**
 * Points of any supported chart: `data` is `number[][]` subgroups, or `number[]` values for
 * `'i-mr'`. Validates the data.
 * @throws SpcInputError naming the offending field, subgroup or value.
 * @example chartPoints('xbar-r', [[1, 2], [3, 5]])
 */
export function chartPoints(kind: ChartKind, data: unknown): ChartPoint[] {
	switch (kind) {
		case 'xbar-r':
			return xbarRPoints(data);
		case 'xbar-s':
			return xbarSPoints(data);
		case 'i-mr':
			return individualsPoints(data);
		case 'between-within':
			return betweenWithinPoints(data);
	}
}

/**
 * Control limits of any supported chart from its points (Phase I; `exclude` leaves
 * points out of the baseline). Judge points later with `evaluateChart(points, limits)`.
 * @throws SpcInputError when `exclude` is invalid or leaves too few points.
 * @example computeLimits('i-mr', chartPoints('i-mr', values), { exclude: [3] })
 */
export function computeLimits(
	kind: ChartKind,
	points: readonly ChartPoint[],
	options: LimitOptions = {}
): ChartLimits {
	switch (kind) {
		case 'xbar-r':
			return xbarRLimits(points, options);
		case 'xbar-s':
			return xbarSLimits(points, options);
		case 'i-mr':
			return individualsLimits(points, options);
		case 'between-within':
			return betweenWithinLimits(points, options);
	}
}

/**
 * Points and limits of any supported chart in one call.
 * @throws SpcInputError as `chartPoints` and `computeLimits`.
 * @example buildChart('xbar-s', subgroups).limits.sigmaWithin
 */
export function buildChart(
	kind: ChartKind,
	data: unknown,
	options: LimitOptions = {}
): ControlChart {
	const points = chartPoints(kind, data);
	return { points, limits: computeLimits(kind, points, options) };
}
