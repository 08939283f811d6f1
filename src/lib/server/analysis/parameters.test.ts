import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { linearRegression, pearsonCorrelation } from '$lib/analysis';
import { openTestDatabase } from '../testing';
import { seedDemoData } from '../seed';
import { parameterEffect, readParameterFilters } from './parameters';
import { ApiError } from '../api';

let t: ReturnType<typeof openTestDatabase>;
beforeAll(async () => {
	t = openTestDatabase();
	await seedDemoData(t.db);
}, 120_000);
afterAll(() => t.close());

const url = (q: string) => new URL(`http://x/api/analysis/parameters?${q}`);

describe('parameterEffect on the demo', () => {
	it('one point per SH-220 run; the line and r are those of the points', () => {
		const a = parameterEffect(
			t.db,
			readParameterFilters(url('parameter=squeegeeSpeedMmS&outcome=volumeMean&product=SH-220'))
		);
		expect(a.n).toBe(24);
		const xs = a.points.map((p) => p.x);
		const ys = a.points.map((p) => p.y);
		const line = linearRegression(xs, ys);
		expect(a.fit!.slope).toBeCloseTo(line.slope, 12);
		expect(a.correlation!.r).toBeCloseTo(pearsonCorrelation(xs, ys).r, 12);
		// The invented response: faster squeegee, less paste (a real, strong negative slope).
		expect(a.fit!.slope).toBeLessThan(0);
		expect(a.correlation!.upper!).toBeLessThan(0);
		expect(a.caution).toMatch(/not a cause/);
		// Each y is the pad-weighted mean volume of that run's boards, straight from SQL.
		const p = a.points[0];
		const direct = t.db.$client
			.prepare(
				`select sum(volume_pct_mean * volume_pct_count) / sum(volume_pct_count) from spi_boards where print_run_id = ?`
			)
			.pluck()
			.get(p.runId) as number;
		expect(p.y).toBeCloseTo(direct, 9);
	});
	it('says why there is no line when the parameter never changed', () => {
		const a = parameterEffect(
			t.db,
			readParameterFilters(url('parameter=squeegeeAngleDeg&outcome=passRate&product=SH-220'))
		);
		expect(a.fit).toBeNull();
		expect(a.reason).toMatch(/same value/);
	});
	it('refuses bad queries by field', () => {
		expect(() => readParameterFilters(url('outcome=volumeMean'))).toThrow();
		try {
			readParameterFilters(url('parameter=colour&outcome=volumeMean&from=2026-02-30&extra=1'));
		} catch (err) {
			const fields = (err as ApiError).fieldProblems.map((f) => f.field);
			expect(fields.sort()).toEqual(['extra', 'from', 'parameter']);
			return;
		}
		throw new Error('expected a 400');
	});
});
