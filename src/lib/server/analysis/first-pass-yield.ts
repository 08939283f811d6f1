import { shiftsBetween, type ShiftSettings } from '$lib/floor/shifts';
import { ApiError } from '../api';
import type { Db } from '../db';
import { siteShiftSettings } from '../floor/shift-settings';
import { checkRange, QueryReader } from './query';

export const YIELD_GROUPINGS = ['line', 'product', 'shift', 'week'] as const;
export type YieldGrouping = (typeof YIELD_GROUPINGS)[number];
/** Board inspections read per request; more is refused with 422 (narrow the dates). */
export const MAX_YIELD_BOARDS = 1_000_000;

export interface YieldFilters {
	by: YieldGrouping;
	line: string | null;
	product: string | null;
	fromMs: number | null;
	toMs: number | null;
}

export function readYieldFilters(url: URL): YieldFilters {
	const q = new QueryReader(url, ['by', 'line', 'product', 'from', 'to']);
	const f: YieldFilters = {
		by: (q.text('by', { oneOf: YIELD_GROUPINGS }) ?? 'line') as YieldGrouping,
		line: q.text('line'),
		product: q.text('product'),
		fromMs: q.instant('from'),
		toMs: q.instant('to', true)
	};
	checkRange(q, f.fromMs, f.toMs);
	q.finish();
	return f;
}

export interface YieldAnswer {
	by: YieldGrouping;
	groups: {
		key: string;
		boards: number;
		passBoards: number;
		firstPassYield: number;
		failingPads: number;
	}[];
	total: { boards: number; passBoards: number; firstPassYield: number | null };
	/** Re-inspections of a serial already inspected earlier (left out of the yield). */
	reinspections: number;
}

/**
 * First-pass SPI yield: of each board's first inspection (by serial; later re-inspections are
 * left out), the share with no failing pad, grouped by line, product, shift of the day (the
 * site's shifts, `SHIFT_STARTS` / `SITE_TIME_ZONE`, default 06:00, 14:00, 22:00 UTC: key
 * `06:00–14:00`, all days together) or ISO week (UTC, e.g. 2026-W09). Reads the stored per-board counts only; the first-inspection test is an index probe
 * on (serial, inspected_at). The work is counted first and refused above MAX_YIELD_BOARDS.
 */
export function firstPassYield(
	db: Db,
	f: YieldFilters,
	shifts: ShiftSettings = siteShiftSettings()
): YieldAnswer {
	const where: string[] = [];
	const params: (string | number)[] = [];
	if (f.line !== null) {
		where.push('b.line_code = ?');
		params.push(f.line);
	}
	if (f.product !== null) {
		where.push('b.product_code = ?');
		params.push(f.product);
	}
	if (f.fromMs !== null) {
		where.push('b.inspected_at >= ?');
		params.push(f.fromMs);
	}
	if (f.toMs !== null) {
		where.push('b.inspected_at < ?');
		params.push(f.toMs);
	}
	const clause = where.length ? `where ${where.join(' and ')}` : '';
	const count = db.$client
		.prepare(`select count(*) from spi_boards b ${clause}`)
		.pluck()
		.get(...params) as number;
	if (count > MAX_YIELD_BOARDS)
		throw new ApiError(422, {
			error: `${count} board inspections match; at most ${MAX_YIELD_BOARDS} are read per request. Narrow the dates (from, to), the line or the product.`
		});
	// Shifts: per minute in SQL (shift starts are whole minutes), folded into shifts below.
	const key =
		f.by === 'line'
			? 'b.line_code'
			: f.by === 'product'
				? 'b.product_code'
				: f.by === 'shift'
					? 'b.inspected_at / 60000'
					: `strftime('%G-W%V', b.inspected_at / 1000, 'unixepoch')`;
	let rows = db.$client
		.prepare(
			`select ${key} as key,
			   sum(first) as boards, sum(first and b.fail_count = 0) as pass_boards,
			   sum(case when first then b.fail_count else 0 end) as failing_pads,
			   sum(not first) as reinspections
			 from (select b.*, not exists (select 1 from spi_boards e
			         where e.serial = b.serial and e.inspected_at < b.inspected_at) as first
			       from spi_boards b ${clause}) b
			 group by 1 order by 1`
		)
		.all(...params) as CountRow[];
	if (f.by === 'shift') rows = byShift(rows as unknown as MinuteRow[], shifts);
	const groups = rows
		.filter((r) => r.boards > 0)
		.map((r) => ({
			key: r.key,
			boards: r.boards,
			passBoards: r.pass_boards,
			firstPassYield: r.pass_boards / r.boards,
			failingPads: r.failing_pads
		}));
	const boards = groups.reduce((s, g) => s + g.boards, 0);
	const passBoards = groups.reduce((s, g) => s + g.passBoards, 0);
	return {
		by: f.by,
		groups,
		total: { boards, passBoards, firstPassYield: boards > 0 ? passBoards / boards : null },
		reinspections: rows.reduce((s, r) => s + r.reinspections, 0)
	};
}

interface CountRow {
	key: string;
	boards: number;
	pass_boards: number;
	failing_pads: number;
	reinspections: number;
}
type MinuteRow = Omit<CountRow, 'key'> & { key: number };

/** Days of shifts laid out per step (shiftsBetween covers at most 400 days at once). */
const SHIFT_SPAN_MS = 300 * 86_400_000;

/**
 * Fold per-minute counts (sorted by minute) into the shift of the day each minute falls in:
 * key `06:00–14:00` (its start to the next start), in the order of the configured starts.
 */
function byShift(rows: MinuteRow[], settings: ShiftSettings): CountRow[] {
	const starts = [...settings.starts].sort();
	const labelOf = (start: string) =>
		`${start}–${starts[(starts.indexOf(start) + 1) % starts.length]}`;
	const out = new Map<string, CountRow>(
		starts.map((s) => [
			labelOf(s),
			{ key: labelOf(s), boards: 0, pass_boards: 0, failing_pads: 0, reinspections: 0 }
		])
	);
	let i = 0;
	while (i < rows.length) {
		const fromMs = rows[i].key * 60_000;
		const toMs = Math.min(fromMs + SHIFT_SPAN_MS, rows[rows.length - 1].key * 60_000 + 60_000);
		const list = shiftsBetween(fromMs, toMs, settings);
		let s = 0;
		for (; i < rows.length && rows[i].key * 60_000 < toMs; i++) {
			const ms = rows[i].key * 60_000;
			while (s < list.length - 1 && list[s].endMs <= ms) s++;
			const g = out.get(labelOf(list[s].start))!;
			g.boards += rows[i].boards;
			g.pass_boards += rows[i].pass_boards;
			g.failing_pads += rows[i].failing_pads;
			g.reinspections += rows[i].reinspections;
		}
	}
	return [...out.values()];
}
