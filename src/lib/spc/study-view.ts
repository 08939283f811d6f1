import { analyzeStudy, type AnalyzeResult, type FieldError } from './analyze';
import type { SpcAnalyzeRequest } from './analyze-request';
import { capabilityHistogram } from './capability-histogram';
import type { CapabilityThresholds } from './capability-assessment';
import type { CapabilityView, ChartView } from './view-types';

const TITLES = {
	'xbar-r': 'X̄/R',
	'xbar-s': 'X̄/S',
	'i-mr': 'I-MR',
	'between-within': 'Between/within'
} as const;

/** Everything the ad-hoc study page shows: the API answer plus points and histogram. */
export type StudyOutcome =
	| { ok: true; result: AnalyzeResult; chart: ChartView; capability: CapabilityView }
	| { ok: false; errors: FieldError[] };

/**
 * The ad-hoc study: `analyzeStudy` (the same validation and numbers as
 * `POST /api/spc/analyze`), plus the points and histogram the page draws. Nothing is stored.
 * @example studyView({ chart: 'i-mr', values: [1, 2, 4, 3] })
 */
export function studyView(
	request: SpcAnalyzeRequest,
	unit = '',
	thresholds?: Partial<CapabilityThresholds>
): StudyOutcome {
	const outcome = analyzeStudy(request, thresholds);
	if (!outcome.ok) return outcome;
	// One computation: the page draws what the API answer was computed from.
	const { chart: built, rules, values, capability: cap } = outcome.study;
	const lsl = request.lsl ?? null;
	const usl = request.usl ?? null;
	const target = request.target ?? null;
	return {
		ok: true,
		result: outcome.result,
		chart: {
			kind: request.chart,
			title: `${TITLES[request.chart]} study`,
			unit,
			points: built.points.map((p, index) => ({
				...p,
				index,
				label: request.chart === 'i-mr' ? `value ${index + 1}` : `subgroup ${index + 1}`,
				boardId: null,
				at: null,
				excluded: false
			})),
			limits: built.limits,
			violations: outcome.result.violations,
			rules,
			phase: 'I',
			limitsVersion: null
		},
		capability: {
			result: cap,
			histogram: capabilityHistogram(values, {
				mean: cap.mean,
				sigmaOverall: cap.sigmaOverall,
				sigmaWithin: cap.sigmaWithin,
				lsl,
				usl
			}),
			lsl,
			usl,
			target,
			message: null,
			assessment: outcome.result.assessment
		}
	};
}
