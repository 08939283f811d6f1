import { describe, expect, it } from 'vitest';
import { linePath, valueDomain, zoneBands } from './control-chart-geometry';

describe('control chart geometry', () => {
	it('shows the points and the limits with 8 % room each side', () => {
		// Range 5..15 (a point beyond the UCL), 8 % of 10 = 0.8 each side.
		const [lo, hi] = valueDomain([15, 9], { lcl: 5, cl: 10, ucl: 13 });
		expect(lo).toBeCloseTo(4.2, 12);
		expect(hi).toBeCloseTo(15.8, 12);
	});

	it('gives a flat chart height', () => {
		const [lo, hi] = valueDomain([4, 4], { lcl: 4, cl: 4, ucl: 4 });
		expect(lo).toBeCloseTo(2.84, 12);
		expect(hi).toBeCloseTo(5.16, 12);
	});

	it('bands the 1σ zones from the limits, A outermost', () => {
		// Western Electric zones: σ = (UCL − CL)/3 = 1 for limits 7, 10, 13.
		const bands = zoneBands({ lcl: 7, cl: 10, ucl: 13 }, false);
		expect(bands.map((b) => [b.name, b.from, b.to])).toEqual([
			['A', 12, 13],
			['B', 11, 12],
			['C', 10, 11],
			['C', 9, 10],
			['B', 8, 9],
			['A', 7, 8]
		]);
	});

	it('lifts the pen at a missing value', () => {
		expect(
			linePath(
				[1, 2, null, 4, Number.NaN, 6],
				(i) => i * 10,
				(v) => 100 - v
			)
		).toBe('M0.0,99.0L10.0,98.0M30.0,96.0M50.0,94.0');
	});
});
