import { describe, it, expect } from 'vitest';
import { betweenWithinChart } from './between-within-chart';
import { chartConstants } from './chart-constants';
import { evaluateChart } from './evaluate-chart';
import { xbarRChart } from './xbar-r-chart';
import { xbarSChart } from './xbar-s-chart';

describe('between/within chart', () => {
	// Board means 10, 12, 11, 13 with a small, equal within spread.
	const data = [10, 12, 11, 13].map((m) => [m - 0.1, m, m + 0.1]);
	const chart = betweenWithinChart(data);
	it('location = individuals chart of the means: x̿ ± 3·MR̄/d2(2)', () => {
		// MRs of means: 2, 1, 2 → MR̄ = 5/3
		const mrBar = 5 / 3;
		const spread = (3 * mrBar) / chartConstants(2).d2;
		expect(chart.limits.location.cl).toBeCloseTo(11.5, 12);
		expect(chart.limits.location.ucl).toBeCloseTo(11.5 + spread, 12);
		expect(chart.limits.movingRange).toEqual({
			lcl: 0,
			cl: expect.closeTo(mrBar, 12),
			ucl: expect.closeTo(chartConstants(2).D4 * mrBar, 12)
		});
		expect(chart.points.map((p) => p.movingRange)).toEqual([
			null,
			expect.closeTo(2, 12),
			expect.closeTo(1, 12),
			expect.closeTo(2, 12)
		]);
	});
	it('within chart = R chart for n ≤ 10, and its limits are far tighter than the between ones', () => {
		const r = xbarRChart(data).limits;
		expect(chart.limits.dispersion).toEqual(r.dispersion);
		expect(chart.limits.sigmaWithin).toBe(r.sigmaWithin);
		// The plain X̄/R chart would flag every board; the between/within chart flags none.
		expect(evaluateChart(xbarRChart(data).points, r, ['we-1']).length).toBeGreaterThan(0);
		expect(evaluateChart(chart.points, chart.limits, ['we-1'])).toEqual([]);
	});
	it('within chart = S chart for n > 10', () => {
		const big = [0, 3, 1, 2].map((m) => Array.from({ length: 12 }, (_, i) => m + (i % 3) * 0.1));
		expect(betweenWithinChart(big).limits.dispersion).toEqual(xbarSChart(big).limits.dispersion);
	});
	it('a jump between consecutive means is reported on the moving-range chart', () => {
		const jumpy = [10, 10.2, 10.1, 10.3, 10.2, 10.1, 30].map((m) => [m - 0.1, m + 0.1]);
		const bw = betweenWithinChart(jumpy, { exclude: [6] });
		const hits = evaluateChart(bw.points, bw.limits, ['we-1']);
		expect(hits).toContainEqual({ rule: 'we-1', chart: 'moving-range', index: 6, points: [6] });
	});
});
