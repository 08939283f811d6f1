import { describe, it, expect } from 'vitest';
import ref from '../../../reference/spc/control-chart-constants.json';
import {
	c4,
	chartConstants,
	chartConstantsTable,
	standardDeviationFactors,
	type ChartConstants
} from './chart-constants';

type Key = 'd2' | 'd3' | 'c4' | 'A2' | 'A3' | 'D3' | 'D4' | 'B3' | 'B4';
const KEYS: Key[] = ['d2', 'd3', 'c4', 'A2', 'A3', 'D3', 'D4', 'B3', 'B4'];
const decimals = ref.printed.decimals as Record<Key, number>;
const roundTo = (x: number, dp: number) => Math.round(x * 10 ** dp) / 10 ** dp;

describe('chartConstants against the independently computed 6-decimal table', () => {
	it.each(ref.computed.rows)('n = $n agrees to ±5e-7 (rounding of the 6th decimal)', (row) => {
		const c = chartConstants(row.n);
		for (const k of KEYS) expect(Math.abs(c[k] - row[k])).toBeLessThanOrEqual(5.01e-7);
	});
});

describe('chartConstants against the printed table (rounded to the printed decimals)', () => {
	it.each(ref.printed.rows)('n = $n matches every printed cell', (row) => {
		const c = chartConstants(row.n);
		for (const k of KEYS) expect(roundTo(c[k], decimals[k])).toBeCloseTo(row[k], 10);
	});
	it.each(ref.knownDifferences)(
		'n = $n $constant printed $printed is a documented $kind ($table)',
		({ n, constant, printed, kind, decimals: dp }) => {
			const exact = chartConstants(n)[constant as Key];
			const unit = 10 ** -dp;
			expect(roundTo(exact, dp)).not.toBeCloseTo(printed, dp + 2);
			if (kind === 'rounding') expect(Math.abs(exact - printed)).toBeLessThan(1.5 * unit);
			else expect(Math.abs(exact - printed)).toBeGreaterThan(1.5 * unit);
		}
	);
	it('E2 = 3/d2(2) rounds to 2.659, not the printed 2.660 (3/1.128)', () => {
		expect(roundTo(3 / chartConstants(2).d2, 3)).toBe(2.659);
		expect(roundTo(3 / 1.128, 3)).toBe(2.66);
	});
});

describe('closed forms for n = 2 (first principles, REFERENCE-FACTS a)', () => {
	it('d2 = 2/√π, d3 = √(2 − 4/π), c4 = √(2/π), D4 = B4 = 1 + 3√(π/2 − 1)', () => {
		const k = chartConstants(2);
		expect(k.d2).toBeCloseTo(2 / Math.sqrt(Math.PI), 12);
		expect(k.d3).toBeCloseTo(Math.sqrt(2 - 4 / Math.PI), 12);
		expect(k.c4).toBeCloseTo(Math.sqrt(2 / Math.PI), 14);
		expect(k.D4).toBeCloseTo(1 + 3 * Math.sqrt(Math.PI / 2 - 1), 11);
		expect(k.B4).toBeCloseTo(k.D4, 11);
	});
});

describe('derived-factor relations and caching', () => {
	it.each(chartConstantsTable().map((k) => [k.n, k] as [number, ChartConstants]))(
		'n = %i: A2, A3, D3, D4, B3, B4 follow from d2, d3, c4',
		(n, k) => {
			expect(k.A2).toBeCloseTo(3 / (k.d2 * Math.sqrt(n)), 14);
			expect(k.A3).toBeCloseTo(3 / (k.c4 * Math.sqrt(n)), 14);
			expect(k.D3 + k.D4).toBeCloseTo(n < 7 ? k.D4 : 2, 12);
			expect(k.B4 - 1).toBeCloseTo((3 * Math.sqrt(1 - k.c4 ** 2)) / k.c4, 14);
			expect(k.B3).toBeCloseTo(Math.max(0, 2 - k.B4), 14);
		}
	);
	it('D3 is clipped to 0 up to n = 6 and B3 up to n = 5 (REFERENCE-FACTS a table)', () => {
		const t = chartConstantsTable();
		expect(t.filter((k) => k.D3 === 0).map((k) => k.n)).toEqual([2, 3, 4, 5, 6]);
		expect(t.filter((k) => k.B3 === 0).map((k) => k.n)).toEqual([2, 3, 4, 5]);
	});
	it('returns the same cached object on repeat calls', () => {
		expect(chartConstants(7)).toBe(chartConstants(7));
	});
	it.each([1, 26, 2.5, NaN, -3])('rejects n = %f', (n) => {
		expect(() => chartConstants(n)).toThrow(/n must be an integer from 2 to 25/);
	});
});

describe('c4 and S factors beyond the table', () => {
	it.each([30, 50, 100])(
		'c4(%i) matches the approximation 4(n−1)/(4n−3) (Montgomery App. VI footnote)',
		(n) => {
			expect(c4(n)).toBeCloseTo((4 * (n - 1)) / (4 * n - 3), 4);
		}
	);
	it('c4 grows towards 1 and B3/B4 bracket 1 for large n', () => {
		const f = standardDeviationFactors(200);
		expect(f.c4).toBeGreaterThan(c4(100));
		expect(f.B3).toBeLessThan(1);
		expect(f.B4).toBeGreaterThan(1);
		expect(f.B4 - 1).toBeCloseTo(3 / (f.c4 * Math.sqrt(2 * 199)), 3);
	});
	it.each([1, 0, 2.5])('c4 rejects n = %f', (n) => {
		expect(() => c4(n)).toThrow(/integer ≥ 2/);
	});
});
