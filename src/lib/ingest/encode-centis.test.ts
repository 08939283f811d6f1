import { describe, expect, it } from 'vitest';
import { decodeCentis, encodeCentis } from './encode-centis';

describe('encodeCentis / decodeCentis', () => {
	it.each([
		['101.25', 10125],
		['-12.5', -1250],
		['0', 0],
		['-0', 0],
		['0.01', 1],
		['-0.07', -7],
		['1.15', 115], // 1.15 * 100 = 114.99999999999999 in binary; rounds back to 115
		['0.29', 29], // 28.999999999999996
		['4.35', 435], // 434.99999999999994
		['999.99', 99999],
		['-5000', -500000]
	])('%s → %i and back', (text, centis) => {
		const value = Number(text);
		expect(encodeCentis(value)).toBe(centis);
		expect(Object.is(encodeCentis(value), -0)).toBe(false);
		expect(decodeCentis(centis)).toBe(value === 0 ? 0 : value);
	});

	it('round-trips every 2-decimal value from −5000.00 to 5000.00 exactly', () => {
		// Exhaustive over the offset range (1 000 001 values): decode(encode(Number(text))) === Number(text).
		const failures: string[] = [];
		for (let k = -500000; k <= 500000; k++) {
			const text = (k / 100).toFixed(2);
			const value = Number(text);
			if (decodeCentis(encodeCentis(value)) !== value || encodeCentis(value) !== k)
				failures.push(text);
		}
		expect(failures).toEqual([]);
	});

	it.each([
		[0.125, 13], // exact binary half: Math.round goes toward +∞
		[-0.125, -12],
		[0.004, 0],
		[101.256, 10126]
	])('rounds %d to %i hundredths', (value, centis) => {
		expect(encodeCentis(value)).toBe(centis);
	});

	it.each([NaN, Infinity, -Infinity, 1e14])('encodeCentis(%d) throws', (value) => {
		expect(() => encodeCentis(value)).toThrow(RangeError);
	});

	it.each([1.5, NaN, 2 ** 53])('decodeCentis(%d) throws', (value) => {
		expect(() => decodeCentis(value)).toThrow(/safe integer/);
	});
});
