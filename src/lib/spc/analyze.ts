import { spcAnalyzeRequestSchema, type SpcAnalyzeRequest } from './analyze-request';
import { jsonTooDeep, MAX_JSON_DEPTH } from '../json/json-depth';
import { processCapability, type CapabilityResult } from './capability';
import {
	assessCapability,
	countOutOfSpec,
	type CapabilityAssessment,
	type CapabilityThresholds
} from './capability-assessment';
import { capabilityJson, type CapabilityJson } from './capability-json';
import type { ChartLimits, ControlChart, ControlLimits } from './chart-types';
import { buildChart } from './control-chart';
import { evaluateChart, type ChartPart } from './evaluate-chart';
import { DEFAULT_RULES, type RuleId } from './run-rules';
import { SpcInputError } from './spc-input-error';

/** One input problem: where (`subgroups[3]`, `values[7]`, `lsl`) and what. */
export interface FieldError {
	field: string;
	message: string;
}

/** Response body of `POST /api/spc/analyze` (numbers unrounded; undefined ones null). */
export interface AnalyzeResult {
	limits: {
		location: ControlLimits;
		dispersion: ControlLimits;
		/** Moving range of the subgroup means (`between-within` only). */
		movingRange?: ControlLimits;
	};
	capability: CapabilityJson;
	/** Stability first, then the verdict on the lower bound (the same as every chart shows). */
	assessment: CapabilityAssessment;
	violations: { rule: RuleId; chart: ChartPart; index: number; points: number[] }[];
}

/** Outcome of `analyzeStudy`: a result (HTTP 200) or field errors (HTTP 422). */
export type AnalyzeOutcome =
	| { ok: true; result: AnalyzeResult; study: ComputedStudy }
	/** `tooLarge`: refused by the work budget before validation (HTTP 413). */
	| { ok: false; errors: FieldError[]; tooLarge?: boolean };

/** What the study computed, beside the API answer, so a page draws it without computing again. */
export interface ComputedStudy {
	chart: ControlChart;
	rules: RuleId[];
	values: number[];
	capability: CapabilityResult;
}

const CHART_NAMES = {
	'xbar-r': 'X-bar/R',
	'xbar-s': 'X-bar/S',
	'i-mr': 'I-MR',
	'between-within': 'between/within'
} as const;

function fieldPath(path: readonly PropertyKey[]): string {
	let out = '';
	for (const key of path) {
		if (typeof key === 'number') out += `[${key}]`;
		else out += out ? `.${String(key)}` : String(key);
	}
	return out || 'body';
}

/** The data to chart: subgroups for X̄ charts, values for I-MR (single-value subgroups too). */
function chartData(req: SpcAnalyzeRequest): { data: number[][] | number[] } | FieldError {
	const name = CHART_NAMES[req.chart];
	if (req.chart === 'i-mr') {
		if (req.values) return { data: req.values };
		if (req.subgroups && req.subgroups.every((g) => g.length === 1)) {
			return { data: req.subgroups.map((g) => g[0]) };
		}
		return {
			field: 'values',
			message: `is required for chart 'i-mr' (an array of individual values)`
		};
	}
	if (req.subgroups) return { data: req.subgroups };
	return {
		field: 'subgroups',
		message:
			`is required for chart '${req.chart}' ` +
			`(${name} needs an array of subgroups; 'values' is for 'i-mr')`
	};
}

/** Why the limits collapse, or null when every chart of the study has a spread. */
function zeroVariationError(limits: ChartLimits, field: string): FieldError | null {
	let what: string | null = null;
	if (limits.kind === 'i-mr') {
		if (!(limits.sigmaWithin > 0)) what = 'all moving ranges are 0 (every value is the same)';
	} else if (!(limits.sigmaWithin > 0)) {
		const statistic =
			limits.kind === 'xbar-s' || (limits.kind === 'between-within' && limits.subgroupSize > 10)
				? 'standard deviation'
				: 'range';
		what = `every subgroup ${statistic} is 0`;
	} else if (limits.movingRange && !(limits.movingRange.cl > 0)) {
		what = 'every subgroup mean is the same, so the moving ranges of the means are all 0';
	}
	if (what === null) return null;
	return {
		field,
		message:
			`zero variation: ${what}, so the control limits collapse onto the centre line; ` +
			'check the gauge resolution or the data'
	};
}

/**
 * Pure core of `POST /api/spc/analyze`: validate the request, build the chart, apply the
 * run rules and compute capability.
 *
 * Request: `{ chart: 'xbar-r' | 'xbar-s' | 'i-mr' | 'between-within', subgroups?: number[][],
 * values?: number[], lsl?, usl?, target?, rules?: RuleId[] }` (default rules we-1..we-4).
 * Subgroup charts need ≥ 2 subgroups of one size (X̄/R: 2..10, X̄/S and between/within: ≥ 2;
 * mixed sizes are refused naming the first subgroup whose size differs from subgroup 0); I-MR
 * needs ≥ 2 values. Between/within adds `limits.movingRange` (moving range of the subgroup
 * means) and its beyond-limit violations as chart `'moving-range'`. Zero variation is refused
 * (limits would collapse). Violation indices are 0-based subgroup/value positions.
 * @example analyzeStudy({ chart: 'i-mr', values: [49.6, 47.6, 49.9, 51.3] })
 */
export function analyzeStudy(
	input: unknown,
	thresholds?: Partial<CapabilityThresholds>
): AnalyzeOutcome {
	const overBudget = studyOverBudget(input);
	if (overBudget) return { ok: false, errors: [overBudget], tooLarge: true };
	const parsed = spcAnalyzeRequestSchema.safeParse(input);
	if (!parsed.success) {
		return {
			ok: false,
			errors: parsed.error.issues.slice(0, 50).map((issue) => ({
				field: fieldPath(issue.path),
				message: issue.message
			}))
		};
	}
	const req = parsed.data;
	const errors: FieldError[] = [];
	const lsl = req.lsl ?? null;
	const usl = req.usl ?? null;
	if (lsl !== null && usl !== null && lsl >= usl) {
		errors.push({ field: 'lsl', message: `LSL ${lsl} must be below USL ${usl}` });
	}
	const source = chartData(req);
	if ('field' in source) return { ok: false, errors: [source, ...errors] };
	const dataField = req.chart === 'i-mr' ? 'values' : 'subgroups';
	let chart: ControlChart;
	try {
		chart = buildChart(req.chart, source.data);
	} catch (e) {
		if (!(e instanceof SpcInputError)) throw e;
		return { ok: false, errors: [{ field: e.field, message: e.reason }, ...errors] };
	}
	const { location, dispersion, movingRange, sigmaWithin } = chart.limits;
	const numbers = [location.lcl, location.ucl, dispersion.ucl, sigmaWithin];
	if (movingRange) numbers.push(movingRange.ucl);
	if (!numbers.every(Number.isFinite)) {
		errors.push({
			field: dataField,
			message: 'values are too large in magnitude to compute finite control limits'
		});
	} else {
		const flat = zeroVariationError(chart.limits, dataField);
		if (flat) errors.push(flat);
	}
	if (errors.length) return { ok: false, errors };

	const rules = [...(req.rules ?? DEFAULT_RULES)];
	const violations = evaluateChart(chart.points, chart.limits, rules).map((v) => ({
		rule: v.rule,
		chart: v.chart,
		index: v.index,
		points: v.points
	}));
	const values = Array.isArray(source.data[0])
		? (source.data as number[][]).flat()
		: (source.data as number[]);
	const cap = processCapability({
		values,
		sigmaWithin: chart.limits.sigmaWithin,
		lsl,
		usl,
		target: req.target ?? null,
		mean: chart.limits.location.cl
	});
	// A study has no stored signals: its stability is what the rules find in the data given.
	const assessment = assessCapability({
		capability: cap,
		lsl,
		usl,
		openSignals: [],
		violations,
		pointsShown: chart.points.length,
		observed: countOutOfSpec(values, lsl, usl),
		thresholds
	});
	return {
		ok: true,
		result: {
			limits: movingRange ? { location, dispersion, movingRange } : { location, dispersion },
			capability: capabilityJson(cap, assessment),
			assessment,
			violations
		},
		study: { chart, rules, values, capability: cap }
	};
}

/** Outcome of `parseAnalyzeBody`: the parsed JSON, or why the text is not JSON. */
export type ParsedBody = { ok: true; value: unknown } | { ok: false; error: string };

/** First bare `NaN` / `Infinity` / `-Infinity` outside string literals, 1-based position. */
function bareNonFinite(text: string): { token: string; at: number } | null {
	let inString = false;
	for (let i = 0; i < text.length; i++) {
		const ch = text[i];
		if (inString) {
			if (ch === '\\') i++;
			else if (ch === '"') inString = false;
		} else if (ch === '"') inString = true;
		else {
			const m = /^-?(NaN|Infinity)/.exec(text.slice(i, i + 9));
			if (m) return { token: m[0], at: i + 1 };
		}
	}
	return null;
}

/**
 * The most numbers one ad-hoc study may hold (values, or all subgroups together): about 0.15 s of
 * work on the request loop at the limit on this 2-core machine (bench:spc prints the figure).
 */
export const MAX_STUDY_VALUES = 50_000;
/** The most values in one subgroup; X-bar/R and X-bar/S tables stop at 25, ours at 100. */
export const MAX_STUDY_SUBGROUP_SIZE = 100;

/**
 * Count a study's numbers before validating or computing anything, so a 25 MB body of numbers
 * is refused at once instead of being checked one element at a time on the request loop.
 */
export function studyOverBudget(input: unknown): FieldError | null {
	if (!input || typeof input !== 'object') return null;
	const { values, subgroups } = input as { values?: unknown; subgroups?: unknown };
	const limit = MAX_STUDY_VALUES.toLocaleString('en-US');
	if (Array.isArray(values) && values.length > MAX_STUDY_VALUES) {
		return {
			field: 'values',
			message: `${values.length.toLocaleString('en-US')} values; the limit is ${limit} per study`
		};
	}
	if (Array.isArray(subgroups)) {
		let total = 0;
		for (let i = 0; i < subgroups.length; i++) {
			const size = Array.isArray(subgroups[i]) ? (subgroups[i] as unknown[]).length : 1;
			if (size > MAX_STUDY_SUBGROUP_SIZE) {
				return {
					field: `subgroups[${i}]`,
					message: `${size} values in one subgroup; the limit is ${MAX_STUDY_SUBGROUP_SIZE}`
				};
			}
			total += size;
			if (total > MAX_STUDY_VALUES) {
				return {
					field: 'subgroups',
					message: `more than ${limit} values in all subgroups; the limit is ${limit} per study`
				};
			}
		}
	}
	return null;
}

/**
 * Read the text of a `POST /api/spc/analyze` body. Scripts often write NaN or Infinity, which
 * JSON cannot carry, so those are named with their position instead of a bare syntax error.
 * @example parseAnalyzeBody('{"values":[1,NaN]}') // { ok: false, error: '… NaN at character 14 …' }
 */
export function parseAnalyzeBody(text: string): ParsedBody {
	if (text.trim() === '') {
		return {
			ok: false,
			error: 'The request body is empty; send a JSON object such as {"chart":"i-mr","values":[…]}.'
		};
	}
	const deep = jsonTooDeep(text);
	if (deep) {
		return {
			ok: false,
			error: `The request body nests deeper than ${MAX_JSON_DEPTH} levels (at character ${deep.at}).`
		};
	}
	try {
		return { ok: true, value: JSON.parse(text) };
	} catch (e) {
		const bad = bareNonFinite(text);
		if (bad) {
			return {
				ok: false,
				error:
					`The request body is not valid JSON: ${bad.token} at character ${bad.at} is not a ` +
					'JSON number; send finite numbers only (leave a missing value out).'
			};
		}
		const detail = e instanceof Error ? e.message : String(e);
		return { ok: false, error: `The request body is not valid JSON (${detail}).` };
	}
}
