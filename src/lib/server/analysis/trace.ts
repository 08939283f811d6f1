import type { Db } from '../db';
import { QueryReader } from './query';
import { iso, runContextLookups, signalQuery } from './run-context';

/** Boards listed for a prefix search (each with its full trace). */
export const MAX_TRACE_BOARDS = 20;
/** Failing and warning pads listed per board (the counts cover all of them). */
export const MAX_LISTED_PADS = 50;

export function readTraceQuery(url: URL): { serial: string } {
	const q = new QueryReader(url, ['serial']);
	const serial = q.text('serial');
	if (serial === null && !q.problems.some((p) => p.field === 'serial'))
		q.problems.push({ field: 'serial', message: 'is required (a board serial or its beginning)' });
	q.finish();
	return { serial: serial as string };
}

export interface BoardTrace {
	board: {
		id: number;
		serial: string;
		inspectedAt: string;
		line: string;
		product: string;
		importId: number;
		pads: number;
		pass: number;
		warn: number;
		fail: number;
		volumePctMean: number | null;
		volumePctSd: number | null;
		teMean: number | null;
		heightUmMean: number | null;
	};
	run: {
		id: number;
		startedAt: string;
		endedAt: string | null;
		bladeCode: string | null;
		parameters: Record<string, unknown>;
		ambientTempC: number | null;
		relativeHumidityPct: number | null;
		deviations: number;
	} | null;
	stencil: {
		id: number;
		name: string;
		revision: string;
		technology: string;
		thicknessUm: number;
	} | null;
	pasteLot: { id: number; lotNumber: string; alloy: string; powderType: number } | null;
	recipe: { id: number; version: number } | null;
	operator: { id: number; name: string } | null;
	/** Pads that warned or failed, worst first (at most MAX_LISTED_PADS). */
	flaggedPads: {
		refdes: string;
		pad: string;
		panelIndex: number;
		result: 'warn' | 'fail';
		volumePct: number | null;
	}[];
	signals: {
		id: number;
		characteristic: string;
		rule: string;
		chartPart: string;
		pointAt: string | null;
		acknowledged: boolean;
	}[];
}

export interface TraceAnswer {
	serial: string;
	/** exact: the serial itself; prefix: serials beginning with it; none: nothing found. */
	match: 'exact' | 'prefix' | 'none';
	boards: BoardTrace[];
	/** More boards matched the prefix than were listed. */
	more: boolean;
}

/**
 * Everything known about a board by its serial: exact first (every inspection of it), else the
 * serials beginning with it. Each step is an index lookup: spi_boards by (serial, inspected_at),
 * the run, stencil, lot, recipe and user by primary key, pads by (board_id, pad_id). The signals
 * scan `spc_signals` (their board lists are JSON), which stays small next to the pad table.
 */
export function traceBoard(db: Db, serial: string): TraceAnswer {
	const c = db.$client;
	let match: TraceAnswer['match'] = 'exact';
	let rows = c
		.prepare(`select * from spi_boards where serial = ? order by inspected_at desc limit ?`)
		.all(serial, MAX_TRACE_BOARDS + 1) as Record<string, unknown>[];
	if (rows.length === 0) {
		match = 'prefix';
		rows = c
			.prepare(
				`select * from spi_boards where serial >= ? and serial < ? order by serial, inspected_at desc limit ?`
			)
			.all(serial, serial + '\uffff', MAX_TRACE_BOARDS + 1) as Record<string, unknown>[];
		if (rows.length === 0) match = 'none';
	}
	const more = rows.length > MAX_TRACE_BOARDS;
	const runOf = c.prepare(`select * from print_runs where id = ?`);
	const lookups = runContextLookups(db);
	const userOf = c.prepare(`select id, name from users where id = ?`);
	const flagged = c.prepare(
		`select d.refdes, d.pad, d.panel_index, m.result, m.volume_centi_pct
		 from spi_pad_measurements m join spi_pads d on d.id = m.pad_id
		 where m.board_id = ? and m.result > 0
		 order by m.result desc, m.volume_centi_pct limit ${MAX_LISTED_PADS}`
	);
	// A substring test first, so only signals naming the board (or run) parse their JSON lists.
	const signalsOf = signalQuery(
		db,
		`(instr(s.board_ids, ?) > 0 and exists (select 1 from json_each(s.board_ids) j where j.value = ?))
		 or (? is not null and instr(s.point_keys, ?) > 0
		     and exists (select 1 from json_each(s.point_keys) k where k.value = ?))`,
		'newest first',
		50
	);
	const boards = rows.slice(0, MAX_TRACE_BOARDS).map((b): BoardTrace => {
		const run = b.print_run_id
			? (runOf.get(b.print_run_id) as Record<string, unknown> | undefined)
			: undefined;
		const stencilId = (b.stencil_id as number | null) ?? (run?.stencil_id as number | null) ?? null;
		const stencil = lookups.stencil(stencilId);
		const lot = lookups.lot(run?.paste_lot_id as number | null | undefined);
		const op = run?.operator_user_id
			? (userOf.get(run.operator_user_id) as { id: number; name: string } | undefined)
			: undefined;
		const runId = (b.print_run_id as number | null) ?? null;
		const runKey = runId === null ? null : `run:${runId}`;
		return {
			board: {
				id: b.id as number,
				serial: b.serial as string,
				inspectedAt: iso(b.inspected_at as number)!,
				line: b.line_code as string,
				product: b.product_code as string,
				importId: b.import_id as number,
				pads: b.pad_count as number,
				pass: b.pass_count as number,
				warn: b.warn_count as number,
				fail: b.fail_count as number,
				volumePctMean: b.volume_pct_mean as number | null,
				volumePctSd: b.volume_pct_sd as number | null,
				teMean: b.te_mean as number | null,
				heightUmMean: b.height_um_mean as number | null
			},
			run: run
				? {
						id: run.id as number,
						startedAt: iso(run.started_at as number)!,
						endedAt: iso(run.ended_at as number | null),
						bladeCode: run.blade_code as string | null,
						parameters: JSON.parse(run.parameters as string) as Record<string, unknown>,
						ambientTempC: run.ambient_temp_c as number | null,
						relativeHumidityPct: run.relative_humidity_pct as number | null,
						deviations: (JSON.parse(run.deviations as string) as unknown[]).length
					}
				: null,
			stencil,
			pasteLot: lot,
			recipe:
				run && run.recipe_id
					? { id: run.recipe_id as number, version: run.recipe_version as number }
					: null,
			operator: op ?? null,
			flaggedPads: (
				flagged.all(b.id) as {
					refdes: string;
					pad: string;
					panel_index: number;
					result: number;
					volume_centi_pct: number | null;
				}[]
			).map((p) => ({
				refdes: p.refdes,
				pad: p.pad,
				panelIndex: p.panel_index,
				result: p.result === 2 ? 'fail' : 'warn',
				volumePct: p.volume_centi_pct === null ? null : p.volume_centi_pct / 100
			})),
			signals: signalsOf(String(b.id), b.id, runKey, runKey, runKey).map((s) => ({
				id: s.id,
				characteristic: s.characteristic,
				rule: s.rule,
				chartPart: s.chartPart,
				pointAt: s.pointAt,
				acknowledged: s.acknowledged !== null
			}))
		};
	});
	return { serial, match, boards, more };
}
