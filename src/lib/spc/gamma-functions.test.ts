import { describe, it, expect } from 'vitest';
import { logGamma, regularizedGammaP } from './gamma-functions';

describe('logGamma (identities, first principles)', () => {
	it.each([1, 2, 3, 5, 10, 20])('Γ(%i) = (n−1)!', (n) => {
		let f = 1;
		for (let k = 2; k < n; k++) f *= k;
		expect(logGamma(n)).toBeCloseTo(Math.log(f), 12);
	});
	it('Γ(1/2) = √π and Γ(3/2) = √π/2', () => {
		expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 13);
		expect(logGamma(1.5)).toBeCloseTo(Math.log(Math.sqrt(Math.PI) / 2), 13);
	});
	it.each([0.1, 0.7, 3.3, 12.5, 150])('Γ(x+1) = xΓ(x) at x = %f', (x) => {
		expect(logGamma(x + 1) - logGamma(x)).toBeCloseTo(Math.log(x), 11);
	});
	it.each([0, -1, NaN])('rejects x = %f', (x) => {
		expect(() => logGamma(x)).toThrow(/x must be > 0/);
	});
});

describe('regularizedGammaP', () => {
	it.each([0.1, 1, 2.5, 7, 30])('P(1, x) = 1 − e^(−x) at x = %f', (x) => {
		expect(regularizedGammaP(1, x)).toBeCloseTo(1 - Math.exp(-x), 14);
	});
	it.each([0.2, 1, 3, 9])('P(1/2, x) = erf(√x) at x = %f (A&S 6.5.17)', (x) => {
		// erf from the independent Taylor series, enough terms for x ≤ 9
		const t = Math.sqrt(x);
		let term = t;
		let sum = t;
		for (let n = 1; n < 200; n++) {
			term *= (-t * t) / n;
			sum += term / (2 * n + 1);
		}
		expect(regularizedGammaP(0.5, x)).toBeCloseTo((2 / Math.sqrt(Math.PI)) * sum, 9);
	});
	it('edges: x = 0 gives 0, x = ∞ gives 1, bad a or x throws', () => {
		expect(regularizedGammaP(3, 0)).toBe(0);
		expect(regularizedGammaP(3, Infinity)).toBe(1);
		expect(() => regularizedGammaP(0, 1)).toThrow(/a must be > 0/);
		expect(() => regularizedGammaP(1, -1)).toThrow(/x must be ≥ 0/);
	});
});
