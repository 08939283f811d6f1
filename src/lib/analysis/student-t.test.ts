import { describe, expect, it } from 'vitest';
import { inverseNormalCdf } from '$lib/spc/inverse-normal-cdf';
import { regularizedBeta, studentTCdf, studentTQuantile } from './student-t';

describe('regularizedBeta', () => {
	it('matches closed forms', () => {
		// I_x(1, b) = 1 − (1 − x)^b; I_x(a, 1) = x^a; I_½(a, a) = ½.
		expect(regularizedBeta(0.3, 1, 4)).toBeCloseTo(1 - 0.7 ** 4, 14);
		expect(regularizedBeta(0.8, 3.5, 1)).toBeCloseTo(0.8 ** 3.5, 14);
		expect(regularizedBeta(0.5, 7, 7)).toBeCloseTo(0.5, 14);
	});
	it('refuses bad arguments', () => {
		expect(() => regularizedBeta(1.2, 1, 1)).toThrow(RangeError);
		expect(() => regularizedBeta(0.5, 0, 1)).toThrow(RangeError);
	});
});

describe('Student t', () => {
	it('matches the closed forms for 1 and 2 degrees of freedom', () => {
		// ν = 1 is Cauchy: Q(p) = tan(π(p − ½)); ν = 2: Q(p) = (2p − 1)/√(2p(1 − p)).
		for (const p of [0.6, 0.9, 0.975, 0.995]) {
			expect(studentTQuantile(p, 1)).toBeCloseTo(Math.tan(Math.PI * (p - 0.5)), 9);
			expect(studentTQuantile(p, 2)).toBeCloseTo((2 * p - 1) / Math.sqrt(2 * p * (1 - p)), 10);
			expect(studentTCdf(Math.tan(Math.PI * (p - 0.5)), 1)).toBeCloseTo(p, 13);
		}
	});
	it('tends to the normal quantile for many degrees of freedom', () => {
		expect(studentTQuantile(0.975, 1e7)).toBeCloseTo(inverseNormalCdf(0.975), 5);
	});
	it('agrees with printed t-table values (three decimals)', () => {
		// t(0.025, 18) = 2.101 is printed in Montgomery & Runger §11-6 (reference/analysis);
		// the others are the common two-sided 95 % table entries (from memory), checked to the
		// printed three decimals only.
		const table: [number, number][] = [
			[18, 2.101],
			[5, 2.571],
			[10, 2.228],
			[30, 2.042]
		];
		for (const [nu, t] of table) expect(studentTQuantile(0.975, nu)).toBeCloseTo(t, 3);
	});
	it('is symmetric and refuses bad arguments', () => {
		expect(studentTQuantile(0.1, 7)).toBeCloseTo(-studentTQuantile(0.9, 7), 12);
		expect(studentTCdf(-1.3, 4) + studentTCdf(1.3, 4)).toBeCloseTo(1, 14);
		expect(() => studentTQuantile(1, 3)).toThrow(RangeError);
		expect(() => studentTQuantile(0.5, 0)).toThrow(RangeError);
	});
});
