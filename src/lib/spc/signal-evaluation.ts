import type { ChartCharacteristic, SourceSubgroup } from './chart-input';
import { pointsFor, ruleList } from './chart-detail';
import type { ChartKind, ChartLimits, ChartPoint } from './chart-types';
import { evaluateChart, type ChartPart } from './evaluate-chart';
import type { RuleId } from './run-rules';
import { SpcInputError } from './spc-input-error';

/** A violation of frozen limits, ready to be stored as a signal unless it is stored already. */
export interface SignalCandidate {
	rule: RuleId;
	chartPart: ChartPart;
	/** Key of the point that completed the pattern. */
	pointKey: string;
	/** Keys of every point in the pattern. */
	pointKeys: string[];
	boardIds: number[];
	pointAt: Date | null;
	value: number | null;
	/** Key of the point before the completing one (a run of the same rule continues from it). */
	previousKey: string | null;
}

function partValue(point: ChartPoint, part: ChartPart): number | null {
	if (part === 'location') return point.location;
	if (part === 'dispersion') return point.dispersion;
	return point.movingRange ?? null;
}

/**
 * Judge a characteristic's newest subgroups against its frozen limits: the rule violations at
 * points after the baseline (`baselineTo`), oldest first. Nothing when the chart kind or the
 * subgroup size no longer match the limits, or the data cannot be charted.
 */
export function signalCandidates(
	c: Pick<ChartCharacteristic, 'chartKind' | 'rules'>,
	subgroups: SourceSubgroup[],
	limits: ChartLimits,
	baselineTo: Date | null
): SignalCandidate[] {
	const kind = c.chartKind as ChartKind;
	if (limits.kind !== kind || subgroups.length === 0) return [];
	let points: ChartPoint[];
	try {
		points = pointsFor(kind, subgroups);
	} catch (e) {
		if (e instanceof SpcInputError) return [];
		throw e;
	}
	if (points[0].size !== limits.subgroupSize) return [];
	const after = baselineTo?.getTime() ?? -Infinity;
	return evaluateChart(points, limits, ruleList(c))
		.filter((v) => {
			const at = subgroups[v.index].at?.getTime();
			return at === undefined || at > after;
		})
		.map((v) => ({
			rule: v.rule,
			chartPart: v.chart,
			pointKey: subgroups[v.index].key,
			pointKeys: v.points.map((i) => subgroups[i].key),
			boardIds: [...new Set(v.points.flatMap((i) => subgroups[i].boardIds))],
			pointAt: subgroups[v.index].at,
			value: partValue(points[v.index], v.chart),
			previousKey: v.index > 0 ? subgroups[v.index - 1].key : null
		}));
}

/** A stored signal as far as runs are concerned. */
export interface RunMember {
	id: number;
	rule: string;
	chartPart: string;
	pointKey: string;
	pointKeys: string[];
	runId: number | null;
}

/**
 * The run a new signal joins: that of a recent signal of the same rule and chart part that
 * ended on the point before it or shares a point with its pattern, else its own id.
 */
export function runIdFor(
	recent: readonly RunMember[],
	signal: { id: number; rule: string; chartPart: string },
	candidate: Pick<SignalCandidate, 'previousKey' | 'pointKeys'>
): number {
	const continues = recent.find(
		(r) =>
			r.rule === signal.rule &&
			r.chartPart === signal.chartPart &&
			(r.pointKey === candidate.previousKey ||
				r.pointKeys.some((k) => candidate.pointKeys.includes(k)))
	);
	return continues ? (continues.runId ?? continues.id) : signal.id;
}
