import { ApiError } from '../api';
import type { Db } from '../db';
import { checkRange, QueryReader } from './query';

export const YIELD_GROUPINGS = ['line', 'product', 'week'] as const;
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
 * left out), the share with no failing pad, grouped by line, product or ISO week (UTC, e.g.
 * 2026-W09). Reads the stored per-board counts only; the first-inspection test is an index probe
 * on (serial, inspected_at). The work is counted first and refused above MAX_YIELD_BOARDS.
 */
export function firstPassYield(db: Db, f: YieldFilters): YieldAnswer {
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
	const key =
		f.by === 'line'
			? 'b.line_code'
			: f.by === 'product'
				? 'b.product_code'
				: `strftime('%G-W%V', b.inspected_at / 1000, 'unixepoch')`;
	const rows = db.$client
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
		.all(...params) as {
		key: string;
		boards: number;
		pass_boards: number;
		failing_pads: number;
		reinspections: number;
	}[];
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
