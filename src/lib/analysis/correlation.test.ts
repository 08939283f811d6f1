import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { inverseNormalCdf } from '$lib/spc/inverse-normal-cdf';
import { pearsonCorrelation } from './correlation';
import { seededRandom } from './seeded-random';

const norris = JSON.parse(
	readFileSync(new URL('../../../reference/analysis/nist-norris.json', import.meta.url), 'utf8')
) as { certified: Record<string, number>; yx: [number, number][] };

describe('pearsonCorrelation', () => {
	it('equals sign(B1)·√R² of NIST Norris (certified R²)', () => {
		const c = pearsonCorrelation(
			norris.yx.map((p) => p[1]),
			norris.yx.map((p) => p[0])
		);
		expect(c.n).toBe(36);
		expect(Math.abs(c.r - Math.sqrt(norris.certified.rSquared))).toBeLessThan(1e-13);
	});
	it('gives the Fisher-z interval by its definition', () => {
		// 90 %, n = 14: atanh(r) ± z(0.95)/√11, mapped back with tanh.
		const x = [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12, 13, 14];
		const y = [3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 8, 9, 7];
		const c = pearsonCorrelation(x, y, 0.9);
		const half = inverseNormalCdf(0.95) / Math.sqrt(14 - 3);
		expect(c.lower).toBeCloseTo(Math.tanh(Math.atanh(c.r) - half), 14);
		expect(c.upper).toBeCloseTo(Math.tanh(Math.atanh(c.r) + half), 14);
		expect(c.lower! < c.r && c.r < c.upper!).toBe(true);
	});
	it('covers the true correlation about 95 % of the time (seeded simulation)', () => {
		// Bivariate normal with ρ = 0.6, n = 25, 4000 repetitions: Fisher's interval is
		// approximate, so allow ±1.5 % (binomial SD 0.34 %).
		const rng = seededRandom(2026);
		const rho = 0.6;
		let hits = 0;
		const trials = 4000;
		for (let t = 0; t < trials; t++) {
			const x: number[] = [];
			const y: number[] = [];
			for (let i = 0; i < 25; i++) {
				const a = rng.normal();
				x.push(a);
				y.push(rho * a + Math.sqrt(1 - rho * rho) * rng.normal());
			}
			const c = pearsonCorrelation(x, y);
			if (c.lower! <= rho && rho <= c.upper!) hits++;
		}
		expect(Math.abs(hits / trials - 0.95)).toBeLessThan(0.015);
	});
	it('has no interval for 3 points or a perfect line, and refuses flat series', () => {
		expect(pearsonCorrelation([1, 2, 3], [1, 3, 2]).lower).toBeNull();
		expect(pearsonCorrelation([1, 2, 3, 4], [2, 4, 6, 8]).upper).toBeNull();
		expect(() => pearsonCorrelation([1, 2, 3], [5, 5, 5])).toThrow(/no spread/);
	});
});
