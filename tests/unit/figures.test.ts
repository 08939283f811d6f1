import { describe, expect, it } from 'vitest';
import { median, quantile } from '../../scripts/lib/figures';

// Worked examples of the nearest-rank method in Wikipedia, "Percentile", section "The
// nearest-rank method" (en.wikipedia.org/wiki/Percentile).
describe('benchmark figures', () => {
	it('quantile follows the nearest-rank worked examples', () => {
		const five = [50, 15, 40, 20, 35]; // order does not matter
		expect(quantile(five, 0.05)).toBe(15);
		expect(quantile(five, 0.3)).toBe(20);
		expect(quantile(five, 0.4)).toBe(20);
		expect(quantile(five, 0.5)).toBe(35);
		expect(quantile(five, 1)).toBe(50);
		const ten = [3, 6, 7, 8, 8, 10, 13, 15, 16, 20];
		expect(quantile(ten, 0.25)).toBe(7);
		expect(quantile(ten, 0.5)).toBe(8);
		expect(quantile(ten, 0.75)).toBe(15);
		expect(quantile(ten, 1)).toBe(20);
		expect(five).toEqual([50, 15, 40, 20, 35]); // the input is not sorted in place
	});

	it('median is the middle value, or the mean of the two middle ones', () => {
		expect(median([15, 20, 35, 40, 50])).toBe(35);
		expect(median([3, 6, 7, 8, 8, 10, 13, 15, 16, 20])).toBe(9);
		expect(median([])).toBeNaN();
		expect(quantile([], 0.95)).toBeNaN();
	});
});
