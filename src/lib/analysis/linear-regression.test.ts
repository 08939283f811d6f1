import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { AnalysisInputError } from './analysis-input-error';
import { linearRegression } from './linear-regression';

const norris = JSON.parse(
	readFileSync(new URL('../../../reference/analysis/nist-norris.json', import.meta.url), 'utf8')
) as { certified: Record<string, number>; yx: [number, number][] };

/** Agreement to `digits` significant digits (NIST's "LRE" idea). */
function expectDigits(actual: number, certified: number, digits: number) {
	expect(Math.abs(actual - certified) / Math.abs(certified)).toBeLessThan(10 ** -digits);
}

describe('linearRegression against NIST StRD Norris (certified values)', () => {
	const x = norris.yx.map((p) => p[1]);
	const y = norris.yx.map((p) => p[0]);
	const fit = linearRegression(x, y);
	const c = norris.certified;
	it('reproduces the estimates and their standard deviations to 10 digits', () => {
		expect(fit.n).toBe(36);
		expectDigits(fit.intercept, c.B0, 10);
		expectDigits(fit.slope, c.B1, 10);
		expectDigits(fit.interceptSe, c.B0StandardDeviation, 10);
		expectDigits(fit.slopeSe, c.B1StandardDeviation, 10);
	});
	it('reproduces residual SD, R² and the sums of squares', () => {
		expectDigits(fit.residualSd, c.residualStandardDeviation, 10);
		expectDigits(fit.rSquared, c.rSquared, 12);
		expectDigits(fit.sse, c.residualSumOfSquares, 9);
		expectDigits(fit.sst - fit.sse, c.regressionSumOfSquares, 10);
		expect(fit.degreesOfFreedom).toBe(c.degreesOfFreedomResidual);
	});
});

describe('weighted least squares', () => {
	it('integer weights give the same line as repeating the points', () => {
		const x = [0.5, 0.8, 1.1, 1.6, 2.0];
		const y = [0.42, 0.7, 0.91, 0.95, 1.02];
		const w = [3, 1, 2, 5, 1];
		const weighted = linearRegression(x, y, w);
		const rx: number[] = [];
		const ry: number[] = [];
		x.forEach((xi, i) => {
			for (let k = 0; k < w[i]; k++) {
				rx.push(xi);
				ry.push(y[i]);
			}
		});
		const repeated = linearRegression(rx, ry);
		expect(weighted.slope).toBeCloseTo(repeated.slope, 12);
		expect(weighted.intercept).toBeCloseTo(repeated.intercept, 12);
		expect(weighted.rSquared).toBeCloseTo(repeated.rSquared, 12);
		// Precision weights: σ̂² uses n − 2 points, so its SE differs from the repeated data's.
		expect(weighted.degreesOfFreedom).toBe(3);
		expect(repeated.degreesOfFreedom).toBe(10);
	});
	it('scaling every weight changes nothing but Σw', () => {
		const x = [1, 2, 3, 4, 5];
		const y = [1.1, 1.9, 3.2, 3.9, 5.3];
		const a = linearRegression(x, y, [1, 2, 1, 2, 1]);
		const b = linearRegression(x, y, [10, 20, 10, 20, 10]);
		expect(b.slope).toBeCloseTo(a.slope, 13);
		expect(b.slopeSe).toBeCloseTo(a.slopeSe, 13);
		expect(b.interceptSe).toBeCloseTo(a.interceptSe, 13);
	});
});

describe('bad input', () => {
	it('is named, never NaN', () => {
		expect(() => linearRegression([1, 2], [1, 2])).toThrow(/3 points/);
		expect(() => linearRegression([1, 2, 3], [1, 2])).toThrow(AnalysisInputError);
		expect(() => linearRegression([1, 1, 1], [1, 2, 3])).toThrow(/no spread/);
		expect(() => linearRegression([1, 2, NaN], [1, 2, 3])).toThrow(/point 3/);
		expect(() => linearRegression([1, 2, 3], [1, 2, 3], [1, 0, 1])).toThrow(/weight 2/);
	});
});
