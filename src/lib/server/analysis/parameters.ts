import {
	linearRegression,
	meanResponseBand,
	pearsonCorrelation,
	runOutcome,
	type RunOutcome
} from '$lib/analysis';
import type { Db } from '../db';
import { checkRange, QueryReader } from './query';

/** Logged print parameters that can be set against an outcome (run columns or parameters JSON). */
export const ANALYSIS_PARAMETERS = {
	squeegeeSpeedMmS: 'Squeegee speed (mm/s)',
	squeegeePressureKg: 'Squeegee pressure (kg)',
	squeegeeAngleDeg: 'Squeegee angle (°)',
	separationSpeedMmS: 'Separation speed (mm/s)',
	wipeIntervalPrints: 'Wipe interval (prints)',
	ambientTempC: 'Temperature (°C)',
	relativeHumidityPct: 'Humidity (% RH)'
} as const;
export type AnalysisParameter = keyof typeof ANALYSIS_PARAMETERS;

export const ANALYSIS_OUTCOMES = {
	volumeMean: 'Volume mean (%)',
	volumeCpk: 'Volume Cpk (50–150 %)',
	passRate: 'SPI pass rate (boards without a failing pad)'
} as const;
export type AnalysisOutcome = keyof typeof ANALYSIS_OUTCOMES;

/** Most recent runs considered per request (bounded work; the answer says when it is reached). */
export const MAX_RUNS = 5000;

export const CORRELATION_CAUTION =
	'A correlation across runs is not a cause: runs differ in product, stencil, paste lot and more at once, and any of them can drive both the setting and the outcome. Use it to choose what to test, then change one setting on purpose.';

export interface ParameterFilters {
	parameter: AnalysisParameter;
	outcome: AnalysisOutcome;
	product: string | null;
	line: string | null;
	fromMs: number | null;
	toMs: number | null;
}

export function readParameterFilters(url: URL): ParameterFilters {
	const q = new QueryReader(url, ['parameter', 'outcome', 'product', 'line', 'from', 'to']);
	const parameter = q.text('parameter', { oneOf: Object.keys(ANALYSIS_PARAMETERS) });
	const outcome = q.text('outcome', { oneOf: Object.keys(ANALYSIS_OUTCOMES) });
	if (parameter === null && !q.problems.some((p) => p.field === 'parameter'))
		q.problems.push({ field: 'parameter', message: 'is required' });
	if (outcome === null && !q.problems.some((p) => p.field === 'outcome'))
		q.problems.push({ field: 'outcome', message: 'is required' });
	const filters = {
		parameter: parameter as AnalysisParameter,
		outcome: outcome as AnalysisOutcome,
		product: q.text('product'),
		line: q.text('line'),
		fromMs: q.instant('from'),
		toMs: q.instant('to', true)
	};
	checkRange(q, filters.fromMs, filters.toMs);
	q.finish();
	return filters;
}

export interface ParameterPoint {
	runId: number;
	startedAt: string;
	line: string;
	product: string;
	boards: number;
	x: number;
	y: number;
}

export interface ParameterAnswer {
	parameter: AnalysisParameter;
	outcome: AnalysisOutcome;
	n: number;
	points: ParameterPoint[];
	fit: {
		intercept: number;
		slope: number;
		interceptSe: number;
		slopeSe: number;
		rSquared: number;
		residualSd: number;
		band: { x: number; fit: number; lower: number; upper: number }[];
	} | null;
	correlation: {
		r: number;
		lower: number | null;
		upper: number | null;
		level: number;
		n: number;
	} | null;
	reason: string | null;
	caution: string;
	runsConsidered: number;
	note: string | null;
}

interface RunRow {
	id: number;
	started_at: number;
	parameters: string;
	ambient_temp_c: number | null;
	relative_humidity_pct: number | null;
	line: string;
	product: string;
	boards: number;
	pass_boards: number;
	pads: number;
	volume_sum: number;
	within_ss: number;
	within_df: number;
}

/**
 * Each run with inspected boards as one point: its logged parameter against its SPI outcome
 * (from the boards' stored aggregates; see `runOutcome`), an ordinary least-squares line with its
 * 95 % mean-response band, and Pearson's r with its Fisher-z interval.
 */
export function parameterEffect(db: Db, f: ParameterFilters): ParameterAnswer {
	const where: string[] = [];
	const params: (string | number)[] = [];
	if (f.product !== null) {
		where.push('p.code = ?');
		params.push(f.product);
	}
	if (f.line !== null) {
		where.push('l.code = ?');
		params.push(f.line);
	}
	if (f.fromMs !== null) {
		where.push('r.started_at >= ?');
		params.push(f.fromMs);
	}
	if (f.toMs !== null) {
		where.push('r.started_at < ?');
		params.push(f.toMs);
	}
	const rows = db.$client
		.prepare(
			`select r.id, r.started_at, r.parameters, r.ambient_temp_c, r.relative_humidity_pct,
			   r.line, r.product,
			   count(b.id) as boards, sum(b.fail_count = 0) as pass_boards,
			   sum(b.volume_pct_count) as pads,
			   sum(coalesce(b.volume_pct_mean, 0) * b.volume_pct_count) as volume_sum,
			   sum(case when b.volume_pct_count > 1 and b.volume_pct_sd is not null
			     then (b.volume_pct_count - 1) * b.volume_pct_sd * b.volume_pct_sd else 0 end) as within_ss,
			   sum(case when b.volume_pct_count > 1 and b.volume_pct_sd is not null
			     then b.volume_pct_count - 1 else 0 end) as within_df
			 from (select r.*, l.code as line, p.code as product from print_runs r
			   join lines l on l.id = r.line_id
			   join products p on p.id = r.product_id
			   ${where.length ? 'where ' + where.join(' and ') : ''}
			   order by r.started_at desc limit ${MAX_RUNS + 1}) r
			 join spi_boards b on b.print_run_id = r.id
			 group by r.id
			 order by r.started_at`
		)
		.all(...params) as RunRow[];
	return buildAnswer(f, rows);
}

function parameterValue(row: RunRow, key: AnalysisParameter): number | null {
	if (key === 'ambientTempC') return row.ambient_temp_c;
	if (key === 'relativeHumidityPct') return row.relative_humidity_pct;
	let parsed: unknown;
	try {
		parsed = JSON.parse(row.parameters);
	} catch {
		return null;
	}
	const v = (parsed as Record<string, unknown>)?.[key];
	return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

function buildAnswer(f: ParameterFilters, rows: RunRow[]): ParameterAnswer {
	const limited = rows.length > MAX_RUNS;
	const points: ParameterPoint[] = [];
	for (const row of rows.slice(-MAX_RUNS)) {
		const x = parameterValue(row, f.parameter);
		const outcome: RunOutcome = runOutcome({
			boards: row.boards,
			passBoards: row.pass_boards,
			pads: row.pads,
			volumeSum: row.volume_sum,
			withinSs: row.within_ss,
			withinDf: row.within_df
		});
		const y = outcome[f.outcome];
		if (x === null || y === null) continue;
		points.push({
			runId: row.id,
			startedAt: new Date(row.started_at).toISOString(),
			line: row.line,
			product: row.product,
			boards: row.boards,
			x,
			y
		});
	}
	const xs = points.map((p) => p.x);
	const ys = points.map((p) => p.y);
	let fit: ParameterAnswer['fit'] = null;
	let correlation: ParameterAnswer['correlation'] = null;
	let reason: string | null = null;
	const spread = (v: number[]) => v.length > 0 && Math.max(...v) > Math.min(...v);
	if (points.length < 3)
		reason = `${points.length} runs with this parameter and inspected boards; a line needs 3`;
	else if (!spread(xs)) reason = 'every run logged the same value of this parameter';
	else if (!spread(ys)) reason = 'every run has the same outcome';
	else {
		const line = linearRegression(xs, ys);
		const lo = Math.min(...xs);
		const hi = Math.max(...xs);
		fit = {
			intercept: line.intercept,
			slope: line.slope,
			interceptSe: line.interceptSe,
			slopeSe: line.slopeSe,
			rSquared: line.rSquared,
			residualSd: line.residualSd,
			band: meanResponseBand(line, lo, hi, 41).map((b) => ({
				x: b.x,
				fit: b.fit,
				lower: b.lower,
				upper: b.upper
			}))
		};
		correlation = pearsonCorrelation(xs, ys);
	}
	return {
		parameter: f.parameter,
		outcome: f.outcome,
		n: points.length,
		points,
		fit,
		correlation,
		reason,
		caution: CORRELATION_CAUTION,
		runsConsidered: Math.min(rows.length, MAX_RUNS),
		note: limited
			? `Only the newest ${MAX_RUNS} runs were used: narrow the dates for older runs.`
			: null
	};
}
