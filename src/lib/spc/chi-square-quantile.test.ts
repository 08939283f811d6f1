import { describe, it, expect } from 'vitest';
import ref from '../../../reference/spc/worked-examples.json';
import { chiSquareCdf, chiSquareQuantile } from './chi-square-quantile';
import { inverseNormalCdf } from './inverse-normal-cdf';

describe('chiSquareQuantile', () => {
	it.each(ref.distributionValues.chiSquareLowerQuantile)(
		'χ²($p, $df) matches the printed table to its decimals',
		({ p, df, value, decimals }) => {
			expect(Math.abs(chiSquareQuantile(p, df) - value)).toBeLessThanOrEqual(0.5 * 10 ** -decimals);
		}
	);
	it.each([0.001, 0.05, 0.5, 0.95, 0.999])('2 df: equals −2 ln(1 − p) exactly at p = %f', (p) => {
		expect(chiSquareQuantile(p, 2)).toBeCloseTo(-2 * Math.log(1 - p), 10);
	});
	it.each([0.01, 0.3, 0.9, 0.99])('1 df: equals z((1+p)/2)² at p = %f', (p) => {
		expect(chiSquareQuantile(p, 1)).toBeCloseTo(inverseNormalCdf((1 + p) / 2) ** 2, 9);
	});
	it.each([
		[0.025, 3],
		[0.975, 7],
		[0.5, 59],
		[0.001, 500],
		[0.999, 0.5]
	])('inverts the CDF at p = %f, df = %f', (p, df) => {
		expect(chiSquareCdf(chiSquareQuantile(p, df), df)).toBeCloseTo(p, 11);
	});
	it.each([
		[0, 5],
		[1, 5],
		[0.5, 0],
		[NaN, 3]
	])('rejects p = %f, df = %f', (p, df) => {
		expect(() => chiSquareQuantile(p, df)).toThrow(RangeError);
	});
});
