import { describe, it, expect } from 'vitest';
import { chartPoints, computeLimits } from './control-chart';
import { evaluateChart } from './evaluate-chart';
import { individualsChart } from './individuals-chart';
import { xbarRChart } from './xbar-r-chart';

describe('evaluateChart', () => {
	it('Phase II: new points are judged against frozen baseline limits', () => {
		const baseline = individualsChart([10, 11, 10, 9, 10, 11, 10, 9]);
		// MR̄ = 1 → σ̂ = 1/d2(2) ≈ 0.886, UCL ≈ 12.66
		const later = chartPoints('i-mr', [10, 13.5, 10]);
		const hits = evaluateChart(later, baseline.limits, ['we-1']);
		expect(hits).toContainEqual({ rule: 'we-1', chart: 'location', index: 1, points: [1] });
		// the jump 10 → 13.5 is a moving range of 3.5 > D4(2)·MR̄ ≈ 3.27, and so is 13.5 → 10
		expect(hits.filter((h) => h.chart === 'dispersion').map((h) => h.index)).toEqual([1, 2]);
	});
	it('Phase I with an exclusion: the excluded point is still judged against the limits', () => {
		const data = [10, 11, 10, 9, 30, 10, 11, 10, 9, 10];
		const points = chartPoints('i-mr', data);
		const limits = computeLimits('i-mr', points, { exclude: [4] });
		const hits = evaluateChart(points, limits, ['we-1']);
		expect(hits.filter((h) => h.chart === 'location').map((h) => h.index)).toEqual([4]);
	});
	it('the dispersion chart gets only the beyond-limit rules, under the selected ids', () => {
		const chart = xbarRChart([
			[10, 10.2],
			[10.1, 10.3],
			[9.9, 10.1],
			[10, 10.1],
			[10, 14],
			[10.1, 10.2],
			[10, 10.2],
			[10.2, 10.3]
		]);
		const both = evaluateChart(chart.points, chart.limits, ['we-1', 'nelson-1', 'nelson-3']);
		const disp = both.filter((h) => h.chart === 'dispersion');
		expect(disp.map((h) => [h.rule, h.index])).toEqual([
			['we-1', 4],
			['nelson-1', 4]
		]);
		const noBeyond = evaluateChart(chart.points, chart.limits, ['nelson-3']);
		expect(noBeyond.filter((h) => h.chart === 'dispersion')).toEqual([]);
	});
	it('default rules are we-1..we-4', () => {
		const chart = individualsChart([
			...new Array(9).fill(0).map((_, i) => i % 2),
			5,
			5,
			5,
			5,
			5,
			5,
			5,
			5
		]);
		const rules = new Set(evaluateChart(chart.points, chart.limits).map((h) => h.rule));
		expect([...rules].every((r) => r.startsWith('we-'))).toBe(true);
		expect(rules.has('we-4')).toBe(true);
	});
});
