import { describe, it, expect } from 'vitest';
import { mean, quantile, range, sampleStandardDeviation } from './summary-statistics';

describe('summary statistics (hand-computed)', () => {
	it.each([
		[[2, 4, 4, 4, 5, 5, 7, 9], 5, 7, Math.sqrt(32 / 7)],
		[[1, 2], 1.5, 1, Math.SQRT1_2],
		[[3], 3, 0, 0],
		[[6, 6, 6], 6, 0, 0]
	])('%j: mean %f, range %f, s %f', (values, m, r, s) => {
		expect(mean(values)).toBeCloseTo(m, 14);
		expect(range(values)).toBe(r);
		expect(sampleStandardDeviation(values)).toBeCloseTo(s, 14);
	});
	it('two-pass s has no cancellation for a large offset', () => {
		expect(sampleStandardDeviation([1e9 + 1, 1e9 + 2, 1e9 + 3])).toBeCloseTo(1, 10);
	});
	it('quantile type 7 (linear between order statistics), input not mutated', () => {
		const v = Object.freeze([4, 1, 3, 2]);
		expect(quantile(v, 0.5)).toBe(2.5);
		expect(quantile(v, 0.25)).toBe(1.75);
		expect(quantile(v, 1)).toBe(4);
		expect(v).toEqual([4, 1, 3, 2]);
	});
	it('mean of an empty array is NaN (callers validate length first)', () => {
		expect(Number.isNaN(mean([]))).toBe(true);
	});
});
