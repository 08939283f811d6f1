import { runOutcome, VOLUME_WINDOW_PCT } from '$lib/analysis';
import { ApiError } from '../api';
import type { Db } from '../db';
import { MAX_MAP_PADS, padClassOf, padFailures } from './failure-map';
import { iso, runContextLookups, signalQuery, type SignalRow } from './run-context';

/** Boards charted in a run report (all are counted; the newest this many are drawn). */
export const MAX_REPORT_BOARDS = 5000;

export type ReportSignal = SignalRow;

export interface RunReport {
	run: {
		id: number;
		line: string;
		product: string;
		startedAt: string;
		endedAt: string | null;
		boardsPrinted: number;
		bladeCode: string | null;
		boardSerial: string | null;
		recipeVersion: number | null;
		operator: string | null;
		ambientTempC: number | null;
		relativeHumidityPct: number | null;
		overrideReason: string | null;
	};
	stencil: {
		id: number;
		name: string;
		revision: string;
		technology: string;
		thicknessUm: number;
	} | null;
	pasteLot: { lotNumber: string; alloy: string; powderType: number } | null;
	/** Each logged parameter beside its recipe window (when the recipe has one). */
	parameters: {
		key: string;
		value: unknown;
		window: { min: number; target: number; max: number } | string | null;
	}[];
	deviations: unknown[];
	deviationReasons: Record<string, string>;
	spi: {
		boards: number;
		passBoards: number;
		firstPassYield: number | null;
		volumeMean: number | null;
		volumeCpk: number | null;
		teMean: number | null;
		series: {
			serial: string;
			inspectedAt: string;
			volumeMean: number | null;
			teMean: number | null;
			fails: number;
		}[];
	};
	topFailing: {
		refdes: string;
		padClass: string;
		fails: number;
		warns: number;
		inspected: number;
	}[];
	signals: ReportSignal[];
	notes: string[];
}

/** Signals of `where` (over `s` = spc_signals), oldest first, at most 500. */
function signalRows(db: Db, where: string, params: unknown[]): ReportSignal[] {
	return signalQuery(db, where, 'oldest first', 500)(...params);
}

/**
 * Everything about one print run for a printed report: the run as logged (parameters beside the
 * recipe windows, deviations and reasons), its stencil, paste lot and operator, the inspection
 * outcome (first-pass yield, volume mean and Cpk against 50–150 %, TE), the boards in order, the
 * components failing most and the control-chart signals of its boards or of the run.
 * @throws ApiError 404 for an unknown run.
 */
export async function runReport(db: Db, runId: number): Promise<RunReport> {
	const c = db.$client;
	const r = c
		.prepare(
			`select r.*, l.code as line, p.code as product, u.name as operator, rc.parameters as recipe_parameters
			 from print_runs r join lines l on l.id = r.line_id join products p on p.id = r.product_id
			 left join users u on u.id = r.operator_user_id left join print_recipes rc on rc.id = r.recipe_id
			 where r.id = ?`
		)
		.get(runId) as Record<string, unknown> | undefined;
	if (!r) throw new ApiError(404, { error: `No print run ${runId}.` });
	const lookups = runContextLookups(db);
	const stencil = lookups.stencil(r.stencil_id as number | null);
	const lot = lookups.lot(r.paste_lot_id as number | null);
	const logged = JSON.parse(r.parameters as string) as Record<string, unknown>;
	const recipe = r.recipe_parameters
		? (JSON.parse(r.recipe_parameters as string) as Record<string, unknown>)
		: {};
	const parameters = Object.entries(logged).map(([key, value]) => ({
		key,
		value,
		window:
			(recipe[key] as { min: number; target: number; max: number } | string | undefined) ?? null
	}));
	const boards = c
		.prepare(
			`select id, serial, inspected_at, pad_count, fail_count, volume_pct_count, volume_pct_mean, volume_pct_sd,
			   te_count, te_mean from spi_boards where print_run_id = ? order by inspected_at, id`
		)
		.all(runId) as {
		id: number;
		serial: string;
		inspected_at: number;
		pad_count: number;
		fail_count: number;
		volume_pct_count: number;
		volume_pct_mean: number | null;
		volume_pct_sd: number | null;
		te_count: number;
		te_mean: number | null;
	}[];
	let pads = 0;
	let volumeSum = 0;
	let withinSs = 0;
	let withinDf = 0;
	let teSum = 0;
	let teCount = 0;
	for (const b of boards) {
		pads += b.volume_pct_count;
		volumeSum += (b.volume_pct_mean ?? 0) * b.volume_pct_count;
		if (b.volume_pct_count > 1 && b.volume_pct_sd !== null) {
			withinSs += (b.volume_pct_count - 1) * b.volume_pct_sd ** 2;
			withinDf += b.volume_pct_count - 1;
		}
		teSum += (b.te_mean ?? 0) * b.te_count;
		teCount += b.te_count;
	}
	const passBoards = boards.filter((b) => b.fail_count === 0).length;
	const outcome = runOutcome({
		boards: boards.length,
		passBoards,
		pads,
		volumeSum,
		withinSs,
		withinDf
	});
	const notes: string[] = [];
	// The failing components: the run's boards up to the map's pad bound.
	let budget = 0;
	const scanned = boards.filter((b) => (budget += b.pad_count) <= MAX_MAP_PADS);
	if (scanned.length < boards.length)
		notes.push(
			`Failing components are counted over the first ${scanned.length} of ${boards.length} boards.`
		);
	const perPad = await padFailures(db, scanned);
	const byRefdes = new Map<string, { fails: number; warns: number; inspected: number }>();
	if (perPad.size > 0) {
		const refdesOf = c
			.prepare(`select id, refdes from spi_pads where product_code = ?`)
			.all(r.product) as {
			id: number;
			refdes: string;
		}[];
		for (const p of refdesOf) {
			const s = perPad.get(p.id);
			if (!s) continue;
			const cur = byRefdes.get(p.refdes) ?? { fails: 0, warns: 0, inspected: 0 };
			cur.fails += s.fails;
			cur.warns += s.warns;
			cur.inspected += s.n;
			byRefdes.set(p.refdes, cur);
		}
	}
	const topFailing = [...byRefdes.entries()]
		.map(([refdes, v]) => ({ refdes, padClass: padClassOf(refdes), ...v }))
		.filter((x) => x.fails > 0)
		.sort((a, b) => b.fails - a.fails || a.refdes.localeCompare(b.refdes))
		.slice(0, 20);
	if (boards.length > MAX_REPORT_BOARDS)
		notes.push(`The chart shows the last ${MAX_REPORT_BOARDS} of ${boards.length} boards.`);
	const signals = signalRows(
		db,
		`exists (select 1 from json_each(s.point_keys) k where k.value = ?)
		 or exists (select 1 from json_each(s.board_ids) j where j.value in (select id from spi_boards where print_run_id = ?))`,
		[`run:${runId}`, runId]
	);
	return {
		run: {
			id: runId,
			line: r.line as string,
			product: r.product as string,
			startedAt: iso(r.started_at as number)!,
			endedAt: iso(r.ended_at as number | null),
			boardsPrinted: r.boards_printed as number,
			bladeCode: r.blade_code as string | null,
			boardSerial: r.board_serial as string | null,
			recipeVersion: r.recipe_version as number | null,
			operator: r.operator as string | null,
			ambientTempC: r.ambient_temp_c as number | null,
			relativeHumidityPct: r.relative_humidity_pct as number | null,
			overrideReason: r.override_reason as string | null
		},
		stencil,
		pasteLot: lot
			? { lotNumber: lot.lotNumber, alloy: lot.alloy, powderType: lot.powderType }
			: null,
		parameters,
		deviations: JSON.parse(r.deviations as string) as unknown[],
		deviationReasons: JSON.parse(r.deviation_reasons as string) as Record<string, string>,
		spi: {
			boards: boards.length,
			passBoards,
			firstPassYield: outcome.passRate,
			volumeMean: outcome.volumeMean,
			volumeCpk: outcome.volumeCpk,
			teMean: teCount > 0 ? teSum / teCount : null,
			series: boards.slice(-MAX_REPORT_BOARDS).map((b) => ({
				serial: b.serial,
				inspectedAt: iso(b.inspected_at)!,
				volumeMean: b.volume_pct_mean,
				teMean: b.te_mean,
				fails: b.fail_count
			}))
		},
		topFailing,
		signals,
		notes
	};
}

export const VOLUME_WINDOW = VOLUME_WINDOW_PCT;

export interface LineWeekReport {
	line: string;
	week: string;
	from: string;
	to: string;
	runs: {
		id: number;
		product: string;
		startedAt: string;
		boards: number;
		firstPassYield: number | null;
		volumeMean: number | null;
		volumeCpk: number | null;
		deviations: number;
	}[];
	byProduct: { product: string; boards: number; passBoards: number; firstPassYield: number }[];
	signals: ReportSignal[];
	total: { runs: number; boards: number; passBoards: number; firstPassYield: number | null };
}

const WEEK = /^(\d{4})-W(\d{2})$/;

/** Monday 00:00 UTC of an ISO week (`2026-W09`), or null when there is no such week. */
export function isoWeekStartMs(week: string): number | null {
	const m = WEEK.exec(week);
	if (!m) return null;
	const year = Number(m[1]);
	const w = Number(m[2]);
	// ISO week 1 holds 4 January; its Monday starts the ISO year.
	const jan4 = Date.UTC(year, 0, 4);
	const monday1 = jan4 - ((new Date(jan4).getUTCDay() + 6) % 7) * 86_400_000;
	const start = monday1 + (w - 1) * 7 * 86_400_000;
	if (w < 1) return null;
	// A week 53 exists only when the year has one: its Thursday must still be in `year`.
	if (new Date(start + 3 * 86_400_000).getUTCFullYear() !== year) return null;
	return start;
}

/**
 * One line's week for a printed report: its runs (each with first-pass yield, volume mean and
 * Cpk from the boards' aggregates), yield by product and the signals of the week with their
 * acknowledgements. Weeks are ISO weeks in UTC.
 * @throws ApiError 404 for an unknown line, 400 for a malformed week.
 */
export function lineWeekReport(db: Db, lineCode: string, week: string): LineWeekReport {
	const start = isoWeekStartMs(week);
	if (start === null)
		throw new ApiError(400, {
			error: 'The request has invalid fields.',
			fields: [{ field: 'week', message: 'must be an ISO week such as 2026-W09' }]
		});
	const end = start + 7 * 86_400_000;
	const c = db.$client;
	const line = c.prepare(`select id, code from lines where code = ?`).get(lineCode) as
		{ id: number; code: string } | undefined;
	if (!line) throw new ApiError(404, { error: `No line ${lineCode}.` });
	const runs = c
		.prepare(
			`select r.id, p.code as product, r.started_at, r.deviations,
			   count(b.id) as boards, coalesce(sum(b.fail_count = 0), 0) as pass_boards,
			   coalesce(sum(b.volume_pct_count), 0) as pads,
			   coalesce(sum(coalesce(b.volume_pct_mean, 0) * b.volume_pct_count), 0) as volume_sum,
			   coalesce(sum(case when b.volume_pct_count > 1 and b.volume_pct_sd is not null
			     then (b.volume_pct_count - 1) * b.volume_pct_sd * b.volume_pct_sd else 0 end), 0) as within_ss,
			   coalesce(sum(case when b.volume_pct_count > 1 and b.volume_pct_sd is not null
			     then b.volume_pct_count - 1 else 0 end), 0) as within_df
			 from print_runs r join products p on p.id = r.product_id
			 left join spi_boards b on b.print_run_id = r.id
			 where r.line_id = ? and r.started_at >= ? and r.started_at < ?
			 group by r.id order by r.started_at`
		)
		.all(line.id, start, end) as {
		id: number;
		product: string;
		started_at: number;
		deviations: string;
		boards: number;
		pass_boards: number;
		pads: number;
		volume_sum: number;
		within_ss: number;
		within_df: number;
	}[];
	const byProduct = new Map<string, { boards: number; passBoards: number }>();
	const outRuns = runs.map((r) => {
		const o = runOutcome({
			boards: r.boards,
			passBoards: r.pass_boards,
			pads: r.pads,
			volumeSum: r.volume_sum,
			withinSs: r.within_ss,
			withinDf: r.within_df
		});
		const g = byProduct.get(r.product) ?? { boards: 0, passBoards: 0 };
		g.boards += r.boards;
		g.passBoards += r.pass_boards;
		byProduct.set(r.product, g);
		return {
			id: r.id,
			product: r.product,
			startedAt: iso(r.started_at)!,
			boards: r.boards,
			firstPassYield: o.passRate,
			volumeMean: o.volumeMean,
			volumeCpk: o.volumeCpk,
			deviations: (JSON.parse(r.deviations) as unknown[]).length
		};
	});
	const boards = runs.reduce((s, r) => s + r.boards, 0);
	const passBoards = runs.reduce((s, r) => s + r.pass_boards, 0);
	return {
		line: line.code,
		week,
		from: iso(start)!,
		to: iso(end)!,
		runs: outRuns,
		byProduct: [...byProduct.entries()]
			.filter(([, g]) => g.boards > 0)
			.map(([product, g]) => ({ product, ...g, firstPassYield: g.passBoards / g.boards })),
		signals: signalRows(
			db,
			`s.point_at >= ? and s.point_at < ? and exists (select 1 from json_each(s.point_keys) k
			   where k.value in (select 'run:' || cast(id as text) from print_runs where line_id = ? and started_at >= ? and started_at < ?))
			 or (s.point_at >= ? and s.point_at < ? and exists (select 1 from json_each(s.board_ids) j
			   where j.value in (select id from spi_boards where line_code = ? and inspected_at >= ? and inspected_at < ?)))`,
			[start, end, line.id, start - 7 * 86_400_000, end, start, end, line.code, start, end]
		),
		total: {
			runs: runs.length,
			boards,
			passBoards,
			firstPassYield: boards > 0 ? passBoards / boards : null
		}
	};
}
