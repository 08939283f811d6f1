import { spcAnalyzeRequestSchema, type SpcAnalyzeRequest } from '../schemas/spc';
import { processCapability } from './capability';
import type { ChartLimits, ControlChart, ControlLimits } from './chart-types';
import { buildChart } from './control-chart';
import { evaluateChart } from './evaluate-chart';
import { DEFAULT_RULES, type RuleId } from './run-rules';
import { SpcInputError } from './spc-input-error';

/** One input problem: where (`subgroups[3]`, `values[7]`, `lsl`) and what. */
export interface FieldError {
	field: string;
	message: string;
}

/** Response body of `POST /api/spc/analyze` (numbers unrounded; undefined ones null). */
export interface AnalyzeResult {
	limits: { location: ControlLimits; dispersion: ControlLimits };
	capability: {
		cp: number | null;
		cpk: number | null;
		pp: number | null;
		ppk: number | null;
		sigmaWithin: number | null;
		sigmaOverall: number;
		mean: number;
		n: number;
		cpu: number | null;
		cpl: number | null;
		ppu: number | null;
		ppl: number | null;
		cpm: number | null;
		cpLower95: number | null;
		cpUpper95: number | null;
		cpkLower95: number | null;
		cpkUpper95: number | null;
		ppkLower95: number | null;
		ppkUpper95: number | null;
		ppmBelowLsl: number | null;
		ppmAboveUsl: number | null;
		/** Expected total ppm out of spec with within σ̂ (normal model). */
		ppmTotal: number | null;
		/** Expected total ppm out of spec with overall s. */
		ppmTotalOverall: number | null;
		reading: string;
		notes: string[];
	};
	violations: { rule: RuleId; chart: 'location' | 'dispersion'; index: number; points: number[] }[];
}

/** Outcome of `analyzeStudy`: a result (HTTP 200) or field errors (HTTP 422). */
export type AnalyzeOutcome =
	| { ok: true; result: AnalyzeResult }
	| { ok: false; errors: FieldError[] };

const CHART_NAMES = { 'xbar-r': 'X-bar/R', 'xbar-s': 'X-bar/S', 'i-mr': 'I-MR' } as const;

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

function zeroVariationError(limits: ChartLimits, field: string): FieldError {
	const what =
		limits.kind === 'i-mr'
			? 'all moving ranges are 0 (every value is the same)'
			: `every subgroup ${limits.kind === 'xbar-s' ? 'standard deviation' : 'range'} is 0`;
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
 * Request: `{ chart: 'xbar-r' | 'xbar-s' | 'i-mr', subgroups?: number[][], values?: number[],
 * lsl?, usl?, target?, rules?: RuleId[] }` (default rules we-1..we-4). X̄ charts need ≥ 2
 * subgroups of one size (X̄/R: 2..10, X̄/S: ≥ 2); I-MR needs ≥ 2 values. Zero variation is
 * refused (limits would collapse). Violation indices are 0-based subgroup/value positions.
 * @example analyzeStudy({ chart: 'i-mr', values: [49.6, 47.6, 49.9, 51.3] })
 */
export function analyzeStudy(input: unknown): AnalyzeOutcome {
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
	const { location, dispersion, sigmaWithin } = chart.limits;
	const numbers = [location.lcl, location.ucl, dispersion.ucl, sigmaWithin];
	if (!numbers.every(Number.isFinite)) {
		errors.push({
			field: dataField,
			message: 'values are too large in magnitude to compute finite control limits'
		});
	} else if (!(sigmaWithin > 0)) errors.push(zeroVariationError(chart.limits, dataField));
	if (errors.length) return { ok: false, errors };

	const rules = req.rules ?? DEFAULT_RULES;
	const violations = evaluateChart(chart.points, chart.limits, rules).map((v) => ({
		rule: v.rule,
		chart: v.chart as 'location' | 'dispersion',
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
	return {
		ok: true,
		result: {
			limits: { location: chart.limits.location, dispersion: chart.limits.dispersion },
			capability: {
				cp: cap.cp,
				cpk: cap.cpk,
				pp: cap.pp,
				ppk: cap.ppk,
				sigmaWithin: cap.sigmaWithin,
				sigmaOverall: cap.sigmaOverall,
				mean: cap.mean,
				n: cap.n,
				cpu: cap.cpu,
				cpl: cap.cpl,
				ppu: cap.ppu,
				ppl: cap.ppl,
				cpm: cap.cpm,
				cpLower95: cap.cpInterval?.lower ?? null,
				cpUpper95: cap.cpInterval?.upper ?? null,
				cpkLower95: cap.cpkInterval?.lower ?? null,
				cpkUpper95: cap.cpkInterval?.upper ?? null,
				ppkLower95: cap.ppkInterval?.lower ?? null,
				ppkUpper95: cap.ppkInterval?.upper ?? null,
				ppmBelowLsl: cap.expectedWithin?.ppmBelowLsl ?? null,
				ppmAboveUsl: cap.expectedWithin?.ppmAboveUsl ?? null,
				ppmTotal: cap.expectedWithin?.ppmTotal ?? null,
				ppmTotalOverall: cap.expectedOverall?.ppmTotal ?? null,
				reading: cap.reading.text,
				notes: cap.notes
			},
			violations
		}
	};
}
