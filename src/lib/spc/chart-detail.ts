import { parameterLabel } from '../printlog';
import {
	assessCapability,
	countOutOfSpec,
	type CapabilityThresholds,
	type ObservedOutOfSpec,
	type OpenSignalRef
} from './capability-assessment';
import { capabilityHistogram } from './capability-histogram';
import { processCapability, type CapabilityResult } from './capability';
import type { ChartCharacteristic, SourceSubgroup } from './chart-input';
import type { ChartKind, ChartLimits, ChartPoint } from './chart-types';
import { chartPoints, computeLimits } from './control-chart';
import { evaluateChart, type Violation } from './evaluate-chart';
import { RULE_IDS, type RuleId } from './run-rules';
import { SpcInputError } from './spc-input-error';
import { summaryCapability } from './summary-capability';
import type { CapabilityView, ChartView } from './view-types';

/** Chart data of the source subgroups for the engine (`number[]` for I-MR). */
export function engineData(kind: ChartKind, subgroups: SourceSubgroup[]): number[] | number[][] {
	return kind === 'i-mr' ? subgroups.map((s) => s.values[0]) : subgroups.map((s) => s.values);
}

/** The most frequent subgroup size (board pad counts can differ by a few missing pads). */
function modalSize(sizes: number[]): number {
	const counts = new Map<number, number>();
	for (const n of sizes) counts.set(n, (counts.get(n) ?? 0) + 1);
	return [...counts].sort((a, b) => b[1] - a[1] || b[0] - a[0])[0][0];
}

/**
 * Chart points of the source subgroups: from the values through the engine, or, for per-board
 * aggregates, directly (x̄, and R for n ≤ 10 or s above; moving range of the means for
 * between/within). Aggregated boards whose pad counts differ are charted with the modal count
 * as n (a few missing pads barely move the constants at these sizes).
 * @throws SpcInputError as the engine's point builders.
 */
export function pointsFor(kind: ChartKind, subgroups: SourceSubgroup[]): ChartPoint[] {
	if (!subgroups.length || !subgroups[0].stats)
		return chartPoints(kind, engineData(kind, subgroups));
	const size = modalSize(subgroups.map((s) => s.stats?.n ?? 0));
	const useRange = kind === 'xbar-r' || (kind === 'between-within' && size <= 10);
	return subgroups.map((s, i) => {
		const st = s.stats ?? { n: 0, mean: NaN, sd: NaN, range: NaN };
		const point: ChartPoint = { location: st.mean, dispersion: useRange ? st.range : st.sd, size };
		if (kind === 'between-within') {
			point.movingRange =
				i === 0 ? null : Math.abs(st.mean - (subgroups[i - 1].stats?.mean ?? NaN));
		}
		return point;
	});
}

/** The characteristic's run rules the engine knows (unknown stored ids are skipped). */
export const ruleList = (c: Pick<ChartCharacteristic, 'rules'>): RuleId[] =>
	c.rules.filter((r): r is RuleId => (RULE_IDS as readonly string[]).includes(r));

/** Phase I limits from the given points: baseline period and exclusions left out. */
export function phaseOneLimits(
	c: Pick<ChartCharacteristic, 'chartKind'>,
	subgroups: SourceSubgroup[],
	points: ChartPoint[],
	excludedKeys: Set<string>,
	from?: Date | null,
	to?: Date | null
): ChartLimits {
	const exclude: number[] = [];
	subgroups.forEach((s, i) => {
		const outside = (from && s.at && s.at < from) || (to && s.at && s.at > to) ? true : false;
		if (outside || excludedKeys.has(s.key)) exclude.push(i);
	});
	return computeLimits(c.chartKind as ChartKind, points, { exclude });
}

/** Pads of per-board aggregated subgroups: a histogram sample and the pads out of spec. */
export interface PadEvidence {
	/** Pad values of the newest boards, for the histogram only. */
	values: number[];
	/** Pads of every shown board outside the spec; null when not countable (e.g. TE). */
	observed: ObservedOutOfSpec | null;
}

/** Everything one chart is computed from, loaded once. */
export interface ChartInputs {
	characteristic: ChartCharacteristic;
	subgroups: SourceSubgroup[];
	/** The newest frozen limits version, or null in Phase I. */
	frozen: { version: number; limits: ChartLimits } | null;
	exclusions: { key: string; reason: string }[];
	/** Phase I baseline period: only points in [from, to] feed the computed limits. */
	baselineFrom?: Date | null;
	baselineTo?: Date | null;
	openSignals: OpenSignalRef[];
	thresholds: CapabilityThresholds;
	/** Required when the subgroups are per-board aggregates (`stats`) and a spec limit is set. */
	pads?: PadEvidence | null;
}

/** The computed chart and capability, or why there is none. */
export interface ComputedChart {
	chart: ChartView | null;
	capability: CapabilityView;
	/** Why there is no chart, or a caveat (too few points, zero variation, type changed). */
	message: string | null;
}

/** Whether `computeChart` will want the pads of these subgroups (loaders skip the query if not). */
export const needsPadEvidence = (
	c: Pick<ChartCharacteristic, 'lsl' | 'usl'>,
	subgroups: readonly SourceSubgroup[]
) => !!subgroups[0]?.stats && (c.lsl != null || c.usl != null);

interface AssessmentContext {
	openSignals: OpenSignalRef[];
	violations: Violation[];
	pointsShown: number;
	thresholds: CapabilityThresholds;
}

function noCapability(
	c: ChartCharacteristic,
	message: string,
	ctx: AssessmentContext
): CapabilityView {
	const assessment = assessCapability({
		capability: null,
		capabilityMessage: message,
		lsl: c.lsl,
		usl: c.usl,
		observed: null,
		...ctx
	});
	return {
		result: null,
		histogram: null,
		lsl: c.lsl,
		usl: c.usl,
		target: c.target,
		message,
		assessment
	};
}

/**
 * The chart of a characteristic: its subgroups judged against the newest frozen limits
 * (Phase II) or against limits computed from the baseline (Phase I), the rule violations, and
 * capability of the shown values with within σ̂ from the limits.
 */
export function computeChart(inputs: ChartInputs): ComputedChart {
	const { characteristic: c, subgroups, exclusions, openSignals, thresholds } = inputs;
	const empty = { openSignals, violations: [], pointsShown: 0, thresholds };
	if (subgroups.length === 0) {
		const message =
			c.measure === 'print-parameter'
				? `No print runs of ${c.productCode} with ${parameterLabel(c.parameterKey ?? '').toLowerCase()} logged yet.`
				: 'No inspection data for this product and these lines yet.';
		return { chart: null, capability: noCapability(c, message, empty), message };
	}
	const kind = c.chartKind as ChartKind;
	let points: ChartPoint[];
	let limits: ChartLimits;
	let message: string | null = null;
	let phase: 'I' | 'II' = 'I';
	let version: number | null = null;
	try {
		points = pointsFor(kind, subgroups);
		const frozen = inputs.frozen;
		const frozenLimits = frozen?.limits;
		if (
			frozen &&
			frozenLimits &&
			frozenLimits.kind === kind &&
			frozenLimits.subgroupSize === points[0].size
		) {
			limits = frozenLimits;
			phase = 'II';
			version = frozen.version;
		} else {
			if (frozen && frozenLimits) {
				message = `The chart type or subgroup size changed since limits v${frozen.version}; these limits are computed (Phase I). Freeze a new version.`;
			}
			const excluded = new Set(exclusions.map((e) => e.key));
			limits = phaseOneLimits(
				c,
				subgroups,
				points,
				excluded,
				inputs.baselineFrom,
				inputs.baselineTo
			);
		}
	} catch (e) {
		if (!(e instanceof SpcInputError)) throw e;
		const msg = `Not enough usable data for a chart yet (${e.field}: ${e.reason}).`;
		return { chart: null, capability: noCapability(c, msg, empty), message: msg };
	}
	if (!(limits.sigmaWithin > 0)) {
		const msg =
			'Zero variation: every subgroup has the same values, so the limits collapse; check the gauge resolution or the data.';
		return { chart: null, capability: noCapability(c, msg, empty), message: msg };
	}
	const rules = ruleList(c);
	const excludedKeys = new Map(exclusions.map((e) => [e.key, e.reason]));
	const chart: ChartView = {
		kind,
		title: c.name,
		unit: c.unit,
		// Explicit fields, not object spread: spread is far slower here and this runs per point.
		points: points.map((p, index) => ({
			location: p.location,
			dispersion: p.dispersion,
			size: p.size,
			movingRange: p.movingRange,
			index,
			key: subgroups[index].key,
			label: subgroups[index].label,
			boardId: subgroups[index].boardId,
			at: subgroups[index].at,
			excluded: phase === 'I' && excludedKeys.has(subgroups[index].key),
			excludeReason: excludedKeys.get(subgroups[index].key) ?? null
		})),
		limits,
		violations: evaluateChart(points, limits, rules),
		rules,
		phase,
		limitsVersion: version
	};
	const capability = capabilityOf(c, subgroups, limits, inputs.pads ?? null, {
		openSignals,
		violations: chart.violations,
		pointsShown: chart.points.length,
		thresholds
	});
	return { chart, capability, message };
}

/** Capability of the shown data: from the values, or from pooled per-board aggregates. */
function capabilityOf(
	c: ChartCharacteristic,
	subgroups: SourceSubgroup[],
	limits: ChartLimits,
	pads: PadEvidence | null,
	ctx: AssessmentContext
): CapabilityView {
	if (c.lsl == null && c.usl == null)
		return noCapability(c, 'Set LSL and/or USL to see capability.', ctx);
	try {
		let result: CapabilityResult;
		let values: number[];
		let observed: ObservedOutOfSpec | null;
		if (subgroups[0]?.stats) {
			result = summaryCapability({
				groups: subgroups.map((s) => s.stats ?? { n: 0, mean: 0, sd: 0 }),
				sigmaWithin: limits.sigmaWithin,
				lsl: c.lsl,
				usl: c.usl,
				target: c.target
			});
			// The histogram shows the pads of the newest boards; the indices use every shown board.
			values = pads?.values ?? [];
			observed = pads?.observed ?? null;
		} else {
			values = subgroups.flatMap((s) => s.values);
			result = processCapability({
				values,
				sigmaWithin: limits.sigmaWithin,
				lsl: c.lsl,
				usl: c.usl,
				target: c.target
			});
			observed = countOutOfSpec(values, c.lsl, c.usl);
		}
		const assessment = assessCapability({
			capability: result,
			lsl: c.lsl,
			usl: c.usl,
			observed,
			...ctx
		});
		return {
			result,
			histogram: values.length
				? capabilityHistogram(values, {
						mean: result.mean,
						sigmaOverall: result.sigmaOverall,
						sigmaWithin: result.sigmaWithin,
						lsl: c.lsl,
						usl: c.usl
					})
				: null,
			lsl: c.lsl,
			usl: c.usl,
			target: c.target,
			message: null,
			assessment
		};
	} catch (e) {
		if (!(e instanceof SpcInputError)) throw e;
		return noCapability(c, `Capability not computed: ${e.field}: ${e.reason}.`, ctx);
	}
}
