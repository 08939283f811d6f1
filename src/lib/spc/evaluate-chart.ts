import type { ChartLimits, ChartPoint, ControlLimits } from './chart-types';
import { BEYOND_LIMIT_RULES, DEFAULT_RULES, detectRunRules, type RuleId } from './run-rules';

/** Which chart of a study a violation is on. */
export type ChartPart = 'location' | 'dispersion' | 'moving-range';

/** One out-of-control signal with 0-based point indices. */
export interface Violation {
	rule: RuleId;
	chart: ChartPart;
	index: number;
	points: number[];
}

function beyondLimits(
	values: readonly (number | null | undefined)[],
	limits: ControlLimits,
	rules: readonly RuleId[],
	chart: ChartPart
): Violation[] {
	const selected = BEYOND_LIMIT_RULES.filter((r) => rules.includes(r));
	const out: Violation[] = [];
	values.forEach((v, index) => {
		if (typeof v !== 'number' || !Number.isFinite(v)) return;
		if (v > limits.ucl || v < limits.lcl) {
			for (const rule of selected) out.push({ rule, chart, index, points: [index] });
		}
	});
	return out;
}

/**
 * Judge chart points against limits: the selected run rules on the location chart, and
 * only the beyond-limit rules (we-1 / nelson-1, whichever are selected) on the dispersion
 * chart and, for between/within charts, on the moving-range chart of the means.
 *
 * Used in Phase I (limits from the same points) and Phase II (new points against frozen
 * limits: pass the stored `ChartLimits`). Returns violations ordered by chart, then index.
 * @throws RangeError for an unknown rule id.
 * @example evaluateChart(chart.points, chart.limits, ['we-1', 'nelson-3'])
 */
export function evaluateChart(
	points: readonly ChartPoint[],
	limits: ChartLimits,
	rules: readonly RuleId[] = DEFAULT_RULES
): Violation[] {
	const location = detectRunRules(
		points.map((p) => p.location),
		limits.location,
		rules
	).map((hit) => ({ ...hit, chart: 'location' as const }));
	const dispersion = beyondLimits(
		points.map((p) => p.dispersion),
		limits.dispersion,
		rules,
		'dispersion'
	);
	const movingRange = limits.movingRange
		? beyondLimits(
				points.map((p) => p.movingRange),
				limits.movingRange,
				rules,
				'moving-range'
			)
		: [];
	return [...location, ...dispersion, ...movingRange];
}
