/**
 * Shared shapes of the control-chart functions. Indices are 0-based subgroup (or value)
 * positions in the order given.
 */

/** Lower control limit, centre line, upper control limit of one chart. */
export interface ControlLimits {
	lcl: number;
	cl: number;
	ucl: number;
}

/** Chart families supported by `computeChartLimits`. */
export type ChartKind = 'xbar-r' | 'xbar-s' | 'i-mr' | 'between-within';

/**
 * One plotted subgroup: its location statistic (x̄, or the individual value) and dispersion
 * statistic (R, s, or moving range; `null` for the first individual, which has no moving
 * range). `movingRange` is set for between/within charts (moving range of subgroup means).
 */
export interface ChartPoint {
	location: number;
	dispersion: number | null;
	size: number;
	movingRange?: number | null;
}

/** Frozen limits of a chart plus the σ estimate behind them. */
export interface ChartLimits {
	kind: ChartKind;
	/** Subgroup size the limits were computed for (1 for individuals). */
	subgroupSize: number;
	location: ControlLimits;
	dispersion: ControlLimits;
	/** Moving-range chart of subgroup means (between/within only). */
	movingRange?: ControlLimits;
	/** Within-subgroup σ̂: R̄/d2, s̄/c4 or MR̄/d2(2). */
	sigmaWithin: number;
	/** True when the dispersion LCL formula gave a negative value and was set to 0. */
	dispersionLclClipped: boolean;
	/** Indices used for the limits (Phase I baseline). */
	baselineIndices: number[];
}

/** Options when computing limits (Phase I). */
export interface LimitOptions {
	/** 0-based indices left out of the baseline, e.g. points with an assignable cause. */
	exclude?: readonly number[];
}

/** A chart with its points and limits, as returned by the chart builders. */
export interface ControlChart {
	points: ChartPoint[];
	limits: ChartLimits;
}
