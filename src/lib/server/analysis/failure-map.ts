import {
	failureKindOf,
	pareto,
	DEFAULT_FAILURE_WINDOWS,
	FAILURE_KIND_LABELS,
	type FailureKind,
	type FailureWindows
} from '$lib/analysis';
import type { Db } from '../db';
import { checkRange, QueryReader } from './query';

/** Pads read per request (newest boards first) and per synchronous slice. */
export const MAX_MAP_PADS = 2_000_000;
export const MAP_PADS_PER_SLICE = 100_000;

export interface FailureMapFilters {
	product: string;
	line: string | null;
	fromMs: number | null;
	toMs: number | null;
}

export function readFailureMapFilters(url: URL): FailureMapFilters {
	const q = new QueryReader(url, ['product', 'line', 'from', 'to']);
	const product = q.text('product');
	if (product === null && !q.problems.some((p) => p.field === 'product'))
		q.problems.push({ field: 'product', message: 'is required (one board layout per map)' });
	const f = {
		product: product as string,
		line: q.text('line'),
		fromMs: q.instant('from'),
		toMs: q.instant('to', true)
	};
	checkRange(q, f.fromMs, f.toMs);
	q.finish();
	return f;
}

export interface FailureMapAnswer {
	product: string;
	boards: number;
	boardsMatched: number;
	/** Every pad that was inspected, with its place when its aperture is known. */
	pads: {
		refdes: string;
		pad: string;
		panelIndex: number;
		xUm: number | null;
		yUm: number | null;
		inspected: number;
		fails: number;
		warns: number;
		failRate: number;
	}[];
	/** Pareto by pad class (the refdes letters: C, R, U, …), most fails first. */
	byClass: {
		padClass: string;
		fails: number;
		warns: number;
		inspected: number;
		failRate: number;
	}[];
	/**
	 * Pareto of the failed pads by kind: the measure that broke its window furthest
	 * (`$lib/analysis/failure-kind`), largest first, with share and cumulative share.
	 */
	byKind: {
		kind: FailureKind;
		label: string;
		fails: number;
		share: number;
		cumulativeShare: number;
	}[];
	/** Failed pads whose worst measure was inside every window (the machine's limits are tighter). */
	failsWithinWindows: number;
	/** The windows the kinds were judged against. */
	windows: FailureWindows;
	note: string | null;
}

/** The letters a reference designator starts with (U12 → U, LED3 → LED); '?' when none. */
export function padClassOf(refdes: string): string {
	return /^[A-Za-z]+/.exec(refdes)?.[0].toUpperCase() ?? '?';
}

/**
 * Inspections, fails and warnings per pad id over the given boards (their pad counts bound the
 * work), in slices with the event loop free between them.
 */
export async function padFailures(
	db: Db,
	boards: readonly { id: number; pad_count: number }[]
): Promise<Map<number, { n: number; fails: number; warns: number }>> {
	const aggregate = db.$client.prepare(
		`select m.pad_id as padId, count(*) as n, sum(m.result = 2) as fails, sum(m.result = 1) as warns
		 from json_each(?) j cross join spi_pad_measurements m on m.board_id = j.value
		 group by m.pad_id`
	);
	const perPad = new Map<number, { n: number; fails: number; warns: number }>();
	for (let i = 0; i < boards.length;) {
		const slice: number[] = [];
		let slicePads = 0;
		while (
			i < boards.length &&
			(slice.length === 0 || slicePads + boards[i].pad_count <= MAP_PADS_PER_SLICE)
		) {
			slicePads += boards[i].pad_count;
			slice.push(boards[i++].id);
		}
		for (const r of aggregate.all(JSON.stringify(slice)) as {
			padId: number;
			n: number;
			fails: number;
			warns: number;
		}[]) {
			const cur = perPad.get(r.padId);
			if (cur) {
				cur.n += r.n;
				cur.fails += r.fails;
				cur.warns += r.warns;
			} else perPad.set(r.padId, { n: r.n, fails: r.fails, warns: r.warns });
		}
		if (i < boards.length) await new Promise((resolve) => setImmediate(resolve));
	}
	return perPad;
}

/**
 * Failed pads by kind over the given boards: each failed pad (result 2) of each board, with the
 * foil thickness of the board's stencil for the height window, classified by `failureKindOf`.
 * In slices like `padFailures` (only failed pads come back to JavaScript).
 */
export async function failureKinds(
	db: Db,
	boards: readonly { id: number; pad_count: number }[],
	windows: FailureWindows = DEFAULT_FAILURE_WINDOWS
): Promise<{ counts: Map<FailureKind, number>; withinWindows: number }> {
	const failed = db.$client
		.prepare(
			`select m.volume_centi_pct as v, m.area_centi_pct as a, m.height_centi_um as h,
			   m.offset_x_centi_um as x, m.offset_y_centi_um as y, s.thickness_um as foil
			 from json_each(?) j cross join spi_boards b on b.id = j.value
			 cross join spi_pad_measurements m on m.board_id = b.id
			 left join stencils s on s.id = b.stencil_id
			 where m.result = 2`
		)
		.raw();
	const counts = new Map<FailureKind, number>();
	let withinWindows = 0;
	for (let i = 0; i < boards.length;) {
		const slice: number[] = [];
		let slicePads = 0;
		while (
			i < boards.length &&
			(slice.length === 0 || slicePads + boards[i].pad_count <= MAP_PADS_PER_SLICE)
		) {
			slicePads += boards[i].pad_count;
			slice.push(boards[i++].id);
		}
		for (const [v, a, h, x, y, foil] of failed.all(JSON.stringify(slice)) as (number | null)[][]) {
			const r = failureKindOf(
				{
					volumePct: v === null ? null : v / 100,
					areaPct: (a as number) / 100,
					heightUm: (h as number) / 100,
					offsetXUm: (x as number) / 100,
					offsetYUm: (y as number) / 100,
					foilUm: foil
				},
				windows
			);
			counts.set(r.kind, (counts.get(r.kind) ?? 0) + 1);
			if (r.reach <= 1) withinWindows++;
		}
		if (i < boards.length) await new Promise((resolve) => setImmediate(resolve));
	}
	return { counts, withinWindows };
}

/**
 * Where SPI failures gather across many boards of one product: per pad, inspections, fails and
 * warnings, placed at its linked aperture's position; and a Pareto by pad class. The pad scan is
 * bounded (newest boards up to MAX_MAP_PADS) and runs in slices with the event loop free between.
 */
export async function failureMap(db: Db, f: FailureMapFilters): Promise<FailureMapAnswer> {
	const c = db.$client;
	const where = ['b.product_code = ?'];
	const params: (string | number)[] = [f.product];
	if (f.line !== null) {
		where.push('b.line_code = ?');
		params.push(f.line);
	}
	if (f.fromMs !== null) {
		where.push('b.inspected_at >= ?');
		params.push(f.fromMs);
	}
	if (f.toMs !== null) {
		where.push('b.inspected_at < ?');
		params.push(f.toMs);
	}
	const boards = c
		.prepare(
			`select b.id, b.pad_count from spi_boards b where ${where.join(' and ')} order by b.inspected_at desc`
		)
		.all(...params) as { id: number; pad_count: number }[];
	const used: number[] = [];
	let pads = 0;
	for (const b of boards) {
		if (pads + b.pad_count > MAX_MAP_PADS) break;
		pads += b.pad_count;
		used.push(b.id);
	}
	const perPad = await padFailures(db, boards.slice(0, used.length));
	const kinds = await failureKinds(db, boards.slice(0, used.length));
	const padRows = c
		.prepare(
			`select p.id, p.refdes, p.pad, p.panel_index, a.x_um, a.y_um from spi_pads p
			 left join apertures a on a.id = p.aperture_id where p.product_code = ?`
		)
		.all(f.product) as {
		id: number;
		refdes: string;
		pad: string;
		panel_index: number;
		x_um: number | null;
		y_um: number | null;
	}[];
	const out: FailureMapAnswer['pads'] = [];
	const classes = new Map<string, { fails: number; warns: number; inspected: number }>();
	for (const p of padRows) {
		const s = perPad.get(p.id);
		if (!s) continue;
		out.push({
			refdes: p.refdes,
			pad: p.pad,
			panelIndex: p.panel_index,
			xUm: p.x_um,
			yUm: p.y_um,
			inspected: s.n,
			fails: s.fails,
			warns: s.warns,
			failRate: s.fails / s.n
		});
		const k = padClassOf(p.refdes);
		const cls = classes.get(k) ?? { fails: 0, warns: 0, inspected: 0 };
		cls.fails += s.fails;
		cls.warns += s.warns;
		cls.inspected += s.n;
		classes.set(k, cls);
	}
	return {
		product: f.product,
		boards: used.length,
		boardsMatched: boards.length,
		pads: out,
		byClass: [...classes.entries()]
			.map(([padClass, v]) => ({ padClass, ...v, failRate: v.fails / v.inspected }))
			.sort((a, b) => b.fails - a.fails || a.padClass.localeCompare(b.padClass)),
		byKind: pareto(kinds.counts).map((r) => ({
			kind: r.key,
			label: FAILURE_KIND_LABELS[r.key],
			fails: r.count,
			share: r.share,
			cumulativeShare: r.cumulativeShare
		})),
		failsWithinWindows: kinds.withinWindows,
		windows: DEFAULT_FAILURE_WINDOWS,
		note:
			used.length < boards.length
				? `Only the newest ${used.length} of ${boards.length} boards were read (at most ${MAX_MAP_PADS} pads): narrow the dates for older boards.`
				: null
	};
}
