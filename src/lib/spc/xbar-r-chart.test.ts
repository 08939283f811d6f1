import { describe, it, expect } from 'vitest';
import ref from '../../../reference/spc/worked-examples.json';
import { chartConstants } from './chart-constants';
import type { ChartPoint } from './chart-types';
import { xbarRChart, xbarRLimits, xbarRPoints } from './xbar-r-chart';

const hb = ref.montgomeryHardBake;

/** 25 subgroup summaries whose means and ranges total Table 6.1's sums (values vary). */
function hardBakePoints(): ChartPoint[] {
	const pts: ChartPoint[] = [];
	for (let i = 0; i < hb.subgroups - 1; i++) {
		pts.push({ location: 1.4 + 0.01 * i, dispersion: 0.2 + 0.01 * i, size: hb.n });
	}
	const sumLoc = pts.reduce((s, p) => s + p.location, 0);
	const sumR = pts.reduce((s, p) => s + (p.dispersion ?? 0), 0);
	pts.push({ location: hb.sumOfMeans - sumLoc, dispersion: hb.sumOfRanges - sumR, size: hb.n });
	return pts;
}

describe('Montgomery ISQC Example 6.1 hard-bake X-bar/R summary', () => {
	const limits = xbarRLimits(hardBakePoints());
	const rel = (a: number, b: number) => Math.abs(a / b - 1);
	it('x̿ = 1.5056 and R̄ = 0.32521 from the table sums', () => {
		expect(limits.location.cl).toBeCloseTo(hb.grandMean, 10);
		expect(limits.dispersion.cl).toBeCloseTo(hb.sumOfRanges / 25, 12);
		expect(limits.dispersion.cl).toBeCloseTo(hb.meanRange, 5);
	});
	it('printed factors reproduce the book limits (checks the formulas)', () => {
		const f = hb.printedFactors;
		expect(hb.grandMean + f.A2 * hb.meanRange).toBeCloseTo(hb.xbarUcl, 4);
		expect(f.D4 * hb.meanRange).toBeCloseTo(hb.rUcl, 5);
	});
	it('exact factors agree with the book within 1e-3 relative (rounded printed factors)', () => {
		expect(rel(limits.location.ucl, hb.xbarUcl)).toBeLessThan(1e-3);
		expect(rel(limits.location.lcl, hb.xbarLcl)).toBeLessThan(1e-3);
		expect(rel(limits.dispersion.ucl, hb.rUcl)).toBeLessThan(1e-3);
		expect(limits.dispersion.lcl).toBe(hb.rLcl);
		expect(limits.dispersion.lcl).toBe(0);
		expect(limits.dispersionLclClipped).toBe(true);
		expect(limits.sigmaWithin).toBeCloseTo(hb.sigmaWithin, 4);
	});
});

describe('xbarRChart from raw subgroups (hand-computed)', () => {
	it('means, ranges and limits follow x̿ ± A2·R̄, D3·R̄..D4·R̄', () => {
		// means 2 and 4, ranges 2 and 4 → x̿ = 3, R̄ = 3
		const chart = xbarRChart([
			[1, 2, 3],
			[2, 4, 6]
		]);
		const k = chartConstants(3);
		expect(chart.points.map((p) => [p.location, p.dispersion])).toEqual([
			[2, 2],
			[4, 4]
		]);
		expect(chart.limits.location).toEqual({ lcl: 3 - 3 * k.A2, cl: 3, ucl: 3 + 3 * k.A2 });
		expect(chart.limits.dispersion).toEqual({ lcl: 0, cl: 3, ucl: 3 * k.D4 });
		expect(chart.limits.sigmaWithin).toBeCloseTo(3 / k.d2, 14);
	});
	it('D3 > 0 for n = 7 gives a positive R LCL and no clipping flag', () => {
		// ranges 6 and 12 → R̄ = 9
		const g = [1, 2, 3, 4, 5, 6, 7];
		const limits = xbarRChart([g, g.map((v) => v * 2)]).limits;
		expect(limits.dispersion.lcl).toBeCloseTo(chartConstants(7).D3 * 9, 12);
		expect(limits.dispersionLclClipped).toBe(false);
	});
	it('excluded subgroups do not enter x̿ or R̄', () => {
		const chart = xbarRChart(
			[
				[1, 3],
				[100, 140],
				[2, 4]
			],
			{ exclude: [1] }
		);
		expect(chart.limits.location.cl).toBe(2.5);
		expect(chart.limits.dispersion.cl).toBe(2);
	});
	it('does not mutate its input', () => {
		const data = Object.freeze([Object.freeze([3, 1]), Object.freeze([2, 5])]);
		xbarRChart(data);
		expect(data).toEqual([
			[3, 1],
			[2, 5]
		]);
	});
});

describe('xbarRPoints bad input', () => {
	it.each([
		[[], /subgroups: is empty/],
		[[[1], [2]], /subgroups\[0\]: subgroup size 1 is below 2 for X-bar\/R; use chart 'i-mr'/],
		[
			[
				[1, 2],
				[3, 4, 5]
			],
			/subgroups\[1\]: has 3 values but subgroup 0 has 2/
		],
		[[new Array(11).fill(1), new Array(11).fill(2)], /subgroup size 11 is above 10.*xbar-s/],
		[[[1, 2]], /subgroups: needs at least 2 subgroups for X-bar\/R, got 1/],
		[
			[
				[1, 2],
				[3, NaN]
			],
			/subgroups\[1\]\[1\]: is NaN/
		],
		[
			[
				[1, 2],
				[3, '4']
			],
			/subgroups\[1\]\[1\]: is "4", expected a finite number/
		],
		[[[1, 2], 3], /subgroups\[1\]: expected an array of numbers/],
		[{}, /subgroups: expected an array of subgroups/]
	])('%j → %s', (data, message) => {
		expect(() => xbarRPoints(data)).toThrow(message);
	});
});
