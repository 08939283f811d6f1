import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import { seedDemoData } from '../seed';
import { isoWeekStartMs, lineWeekReport, runReport } from './reports';

let t: ReturnType<typeof openTestDatabase>;
beforeAll(async () => {
	t = openTestDatabase();
	await seedDemoData(t.db);
}, 120_000);
afterAll(() => t.close());

const one = (sql: string, ...p: unknown[]) =>
	t.db.$client
		.prepare(sql)
		.pluck()
		.get(...p) as number;

describe('isoWeekStartMs', () => {
	it('gives the Monday of ISO weeks, and null for weeks that do not exist', () => {
		expect(isoWeekStartMs('2026-W01')).toBe(Date.UTC(2025, 11, 29));
		expect(isoWeekStartMs('2026-W10')).toBe(Date.UTC(2026, 2, 2));
		expect(isoWeekStartMs('2020-W53')).toBe(Date.UTC(2020, 11, 28)); // 2020 has 53 ISO weeks
		expect(isoWeekStartMs('2021-W53')).toBeNull();
		expect(isoWeekStartMs('2026-W00')).toBeNull();
		expect(isoWeekStartMs('2026-9')).toBeNull();
	});
});

describe('runReport', () => {
	it('an SH-220 run: parameters beside the recipe, outcome from its boards, failing components', async () => {
		const runId = one(
			`select r.id from print_runs r join products p on p.id = r.product_id where p.code = 'SH-220' order by r.started_at limit 1`
		);
		const rep = await runReport(t.db, runId);
		expect(rep.run.line).toBe('SMT-2');
		expect(rep.stencil?.name).toBe('ST-SH220');
		expect(rep.run.operator).toBe('Cleo Marrowby');
		const speed = rep.parameters.find((p) => p.key === 'squeegeeSpeedMmS')!;
		expect(speed.window).toEqual({ min: 25, target: 50, max: 80 });
		expect(rep.spi.boards).toBe(12);
		expect(rep.spi.series).toHaveLength(12);
		expect(rep.spi.firstPassYield).toBeCloseTo(
			one(`select avg(fail_count = 0) from spi_boards where print_run_id = ?`, runId),
			12
		);
		expect(rep.spi.volumeMean).toBeCloseTo(
			one(
				`select sum(volume_pct_mean * volume_pct_count) / sum(volume_pct_count) from spi_boards where print_run_id = ?`,
				runId
			),
			9
		);
		expect(rep.topFailing[0].padClass).toBe('U');
		expect(rep.topFailing[0].fails).toBe(
			one(
				`select count(*) from spi_pad_measurements m join spi_pads d on d.id = m.pad_id
				 where m.board_id in (select id from spi_boards where print_run_id = ?) and m.result = 2 and d.refdes = ?`,
				runId,
				rep.topFailing[0].refdes
			)
		);
	});
	it('names the signals of a run', async () => {
		const s = t.db.$client
			.prepare(`select id, point_keys from spc_signals order by id limit 1`)
			.get() as {
			id: number;
			point_keys: string;
		};
		const key = (JSON.parse(s.point_keys) as string[]).find((k) => k.startsWith('run:'))!;
		const rep = await runReport(t.db, Number(key.slice(4)));
		expect(rep.signals.map((x) => x.id)).toContain(s.id);
	});
	it('404 for an unknown run', async () => {
		await expect(runReport(t.db, 999999)).rejects.toMatchObject({ status: 404 });
	});
});

describe('lineWeekReport', () => {
	it('the runs of one line and ISO week with yield by product', () => {
		const first = one(
			`select min(started_at) from print_runs where line_id = (select id from lines where code = 'SMT-2')`
		);
		const week = t.db.$client
			.prepare(`select strftime('%G-W%V', ? / 1000, 'unixepoch')`)
			.pluck()
			.get(first) as string;
		const rep = lineWeekReport(t.db, 'SMT-2', week);
		const start = isoWeekStartMs(week)!;
		expect(rep.runs.length).toBe(
			one(
				`select count(*) from print_runs where line_id = (select id from lines where code = 'SMT-2') and started_at >= ? and started_at < ?`,
				start,
				start + 7 * 86_400_000
			)
		);
		expect(rep.runs.length).toBeGreaterThan(0);
		expect(rep.byProduct.map((p) => p.product)).toEqual(['SH-220']);
		expect(rep.total.boards).toBe(rep.runs.reduce((s, r) => s + r.boards, 0));
		expect(() => lineWeekReport(t.db, 'SMT-2', '2026-W60')).toThrow();
		expect(() => lineWeekReport(t.db, 'NOPE', week)).toThrow();
	});
});
