import { describe, it, expect } from 'vitest';
import { standardDeviationFactors } from './chart-constants';
import type { ChartPoint } from './chart-types';
import { xbarRChart } from './xbar-r-chart';
import { xbarSChart, xbarSLimits, xbarSPoints } from './xbar-s-chart';

describe('X-bar/S chart', () => {
	it('for n = 2 the X̄ limits equal the X̄/R ones, since s = R/√2 (REFERENCE-FACTS a)', () => {
		const data = [
			[10, 12],
			[11, 11.5],
			[9, 12.5],
			[10.2, 10.9]
		];
		const r = xbarRChart(data).limits;
		const s = xbarSChart(data).limits;
		expect(s.location.ucl).toBeCloseTo(r.location.ucl, 12);
		expect(s.location.lcl).toBeCloseTo(r.location.lcl, 12);
		expect(s.sigmaWithin).toBeCloseTo(r.sigmaWithin, 12);
		expect(s.dispersion.ucl).toBeCloseTo(r.dispersion.ucl / Math.SQRT2, 12);
	});
	it('piston-ring summary (Montgomery ISQC Example 6.3, from memory): x̿ 74.001, s̄ 0.0094', () => {
		const points: ChartPoint[] = Array.from({ length: 25 }, () => ({
			location: 74.001,
			dispersion: 0.0094,
			size: 5
		}));
		const limits = xbarSLimits(points);
		expect(limits.location.ucl).toBeCloseTo(74.014, 3);
		expect(limits.location.lcl).toBeCloseTo(73.988, 3);
		expect(limits.dispersion.ucl).toBeCloseTo(0.0196, 4);
		expect(limits.dispersion.lcl).toBe(0);
	});
	it('accepts any equal size ≥ 2, e.g. 30 deposits per board, with c4 from the gamma function', () => {
		const groups = [0, 1, 2].map((g) => Array.from({ length: 30 }, (_, i) => g + (i % 5)));
		const chart = xbarSChart(groups);
		const f = standardDeviationFactors(30);
		const sd = chart.points[0].dispersion as number;
		expect(chart.limits.sigmaWithin).toBeCloseTo(sd / f.c4, 12);
		expect(chart.limits.dispersion.lcl).toBeCloseTo(f.B3 * sd, 12);
		expect(chart.limits.dispersionLclClipped).toBe(false);
	});
	it.each([
		[
			[
				[1, 2],
				[3, 4, 5]
			],
			/subgroups\[1\]: has 3 values but subgroup 0 has 2; X-bar\/S needs equal/
		],
		[[[1], [2]], /subgroup size 1 is below 2 for X-bar\/S/],
		[[[1, 2, 3]], /needs at least 2 subgroups/]
	])('refuses %j', (data, message) => {
		expect(() => xbarSPoints(data)).toThrow(message);
	});
});
