import type { CapabilityAssessment, CapabilityVerdict } from './capability-assessment';
import type { ChartJsonInput } from './api-json';

/** What a summary row reads: the computed chart and the characteristic's names and state. */
export interface SummaryInput extends ChartJsonInput {
	characteristic: ChartJsonInput['characteristic'] & { measureLabel: string; active: boolean };
}

/** One row of the summary page and `GET /api/charts`. */
export interface ChartSummaryRow {
	id: number;
	name: string;
	productCode: string;
	lineCodes: string[];
	measure: string;
	measureLabel: string;
	parameterKey: string | null;
	chartKind: string;
	unit: string;
	lsl: number | null;
	target: number | null;
	usl: number | null;
	rules: string[];
	active: boolean;
	phase: 'I' | 'II' | null;
	limitsVersion: number | null;
	points: number;
	openSignals: number;
	cpk: number | null;
	ppk: number | null;
	/** The assessment's verdict (the same the chart page, the API and e-mails show). */
	level: CapabilityVerdict;
	assessment: CapabilityAssessment;
	message: string | null;
}

/** Summary row from a chart detail. */
export function summaryRow(d: SummaryInput, openSignals: number): ChartSummaryRow {
	const c = d.characteristic;
	const cap = d.capability.result;
	return {
		id: c.id,
		name: c.name,
		productCode: c.productCode,
		lineCodes: c.lineCodes,
		measure: c.measure,
		measureLabel: c.measureLabel,
		parameterKey: c.parameterKey,
		chartKind: c.chartKind,
		unit: c.unit,
		lsl: c.lsl,
		target: c.target,
		usl: c.usl,
		rules: c.rules,
		active: c.active,
		phase: d.chart?.phase ?? null,
		limitsVersion: d.chart?.limitsVersion ?? null,
		points: d.chart?.points.length ?? 0,
		openSignals,
		cpk: cap?.cpk ?? null,
		ppk: cap?.ppk ?? null,
		level: d.capability.assessment.verdict,
		assessment: d.capability.assessment,
		message: d.message ?? d.capability.message
	};
}

const VERDICT_ORDER: Record<CapabilityVerdict, number> = {
	'not-stable': 0,
	'not-capable': 1,
	marginal: 2,
	capable: 3,
	'not-assessed': 4
};

/**
 * Summary rows worst first: not stable (most open signals first), then not capable, marginal,
 * capable (lowest bound first), not assessed last; by name within a tie.
 */
export function sortSummaryRows(rows: ChartSummaryRow[]): ChartSummaryRow[] {
	const bound = (r: ChartSummaryRow) => r.assessment.basis?.lowerBound ?? Infinity;
	return rows.sort(
		(a, b) =>
			VERDICT_ORDER[a.level] - VERDICT_ORDER[b.level] ||
			b.openSignals - a.openSignals ||
			bound(a) - bound(b) ||
			a.name.localeCompare(b.name)
	);
}
