import { chartConstants } from './chart-constants';
import type { ChartLimits, ChartPoint, ControlChart, LimitOptions } from './chart-types';
import { SpcInputError } from './spc-input-error';
import { mean } from './summary-statistics';
import { baselineIndices, validateValues } from './validate-input';

/** Fewest values for an individuals chart: two give one moving range. */
export const INDIVIDUALS_MIN_VALUES = 2;

/**
 * Points of an individuals/moving-range chart. Moving range i = |xᵢ − xᵢ₋₁| belongs to
 * point i (the later of the two); point 0 has dispersion `null`.
 * @throws SpcInputError for non-numbers or fewer than 2 values.
 * @example individualsPoints([1, 4, 2]).map((p) => p.dispersion) // [null, 3, 2]
 */
export function individualsPoints(values: unknown): ChartPoint[] {
	const xs = validateValues(values, 'values', INDIVIDUALS_MIN_VALUES);
	return xs.map((x, i) => ({
		location: x,
		dispersion: i === 0 ? null : Math.abs(x - xs[i - 1]),
		size: 1
	}));
}

/**
 * Mean of the moving ranges whose both ends are in the baseline (a moving range that
 * touches an excluded point is excluded too, so one bad value does not inflate MR̄).
 * Returns the mean and the number of ranges used (mean 0 when there are none).
 * @example baselineMovingRangeMean([1, 2, 10, 3, 4], [0, 1, 3, 4]) // { mean: 1, count: 2 }
 */
export function baselineMovingRangeMean(
	series: readonly number[],
	kept: readonly number[]
): { mean: number; count: number } {
	const inBase = new Set(kept);
	const ranges: number[] = [];
	for (let i = 1; i < series.length; i++) {
		if (inBase.has(i) && inBase.has(i - 1)) ranges.push(Math.abs(series[i] - series[i - 1]));
	}
	return { mean: ranges.length ? mean(ranges) : 0, count: ranges.length };
}

/**
 * I-MR limits (Phase I): I chart x̄ ± 3·MR̄/d2(2) (d2(2) = 2/√π ≈ 1.128), MR chart
 * LCL 0, UCL D4(2)·MR̄ ≈ 3.267·MR̄; σ̂ within = MR̄/d2(2).
 * Reference: NIST/SEMATECH e-Handbook §6.3.2.2; Montgomery ISQC §6.4.
 * @throws SpcInputError when `exclude` is out of range or leaves no adjacent pair.
 * @example individualsLimits(individualsPoints([49.6, 47.6, 49.9])).location.cl
 */
export function individualsLimits(
	points: readonly ChartPoint[],
	options: LimitOptions = {}
): ChartLimits {
	const k2 = chartConstants(2);
	const kept = baselineIndices(points.length, options.exclude, INDIVIDUALS_MIN_VALUES);
	const series = points.map((p) => p.location);
	const centre = mean(kept.map((i) => series[i]));
	const mr = baselineMovingRangeMean(series, kept);
	if (mr.count === 0) {
		throw new SpcInputError(
			'exclude',
			'leaves no two consecutive baseline values, so no moving range can be formed'
		);
	}
	const sigma = mr.mean / k2.d2;
	return {
		kind: 'i-mr',
		subgroupSize: 1,
		location: { lcl: centre - 3 * sigma, cl: centre, ucl: centre + 3 * sigma },
		dispersion: { lcl: 0, cl: mr.mean, ucl: k2.D4 * mr.mean },
		sigmaWithin: sigma,
		dispersionLclClipped: true,
		baselineIndices: kept
	};
}

/**
 * Build an individuals/moving-range chart.
 * @throws SpcInputError as `individualsPoints` and `individualsLimits`.
 * @example individualsChart([49.6, 47.6, 49.9, 51.3]).limits.sigmaWithin
 */
export function individualsChart(values: unknown, options: LimitOptions = {}): ControlChart {
	const points = individualsPoints(values);
	return { points, limits: individualsLimits(points, options) };
}
