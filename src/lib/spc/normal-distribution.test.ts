import { describe, it, expect } from 'vitest';
import ref from '../../../reference/spc/worked-examples.json';
import { erf, erfc, normalCdf, normalPdf } from './normal-distribution';
import { inverseNormalCdf } from './inverse-normal-cdf';

const d = ref.distributionValues;

describe('erf / erfc against A&S Table 7.1 values (from memory)', () => {
	it.each(d.erf)('erf($x)', ({ x, value }) => {
		expect(erf(x)).toBeCloseTo(value, 14);
		expect(erf(-x)).toBeCloseTo(-value, 14);
	});
	it.each(d.erfc)('erfc($x) to 1e-12 relative', ({ x, value }) => {
		expect(Math.abs(erfc(x) / value - 1)).toBeLessThan(1e-12);
	});
	it('is continuous across the series / continued-fraction switch at 2.5', () => {
		const below = erfc(2.5 - 1e-12);
		const above = erfc(2.5 + 1e-12);
		expect(Math.abs(below / above - 1)).toBeLessThan(1e-10);
	});
});

describe('normalCdf against A&S Table 26.1 values (from memory) and identities', () => {
	it.each(d.normalCdf)('Φ($z)', ({ z, value }) => {
		expect(Math.abs(normalCdf(z) / value - 1)).toBeLessThan(1e-12);
	});
	it.each([0.3, 1.7, 2.6, 4.2, 8])('Φ(z) + Φ(−z) = 1 at z = %f', (z) => {
		expect(normalCdf(z) + normalCdf(-z)).toBeCloseTo(1, 15);
	});
	it.each([-4, -1.2, 0, 0.7, 3.1])('dΦ/dz = φ at z = %f (central difference)', (z) => {
		const h = 1e-5;
		expect((normalCdf(z + h) - normalCdf(z - h)) / (2 * h)).toBeCloseTo(normalPdf(z), 9);
	});
	it('handles edge inputs without NaN surprises', () => {
		expect(normalCdf(0)).toBe(0.5);
		expect(normalCdf(Infinity)).toBe(1);
		expect(normalCdf(-Infinity)).toBe(0);
		expect(normalCdf(-40)).toBe(0);
		expect(Number.isNaN(normalCdf(NaN))).toBe(true);
	});
});

describe('inverseNormalCdf', () => {
	it.each(d.normalQuantile)('z($p) matches the standard table value', ({ p, z }) => {
		expect(inverseNormalCdf(p)).toBeCloseTo(z, 12);
		expect(inverseNormalCdf(1 - p)).toBeCloseTo(-z, 12);
	});
	it.each([1e-300, 1e-15, 1e-6, 0.02, 0.024, 0.03, 0.5, 0.77, 0.99])(
		'round-trips Φ(z(p)) = p at %f',
		(p) => {
			expect(Math.abs(normalCdf(inverseNormalCdf(p)) / p - 1)).toBeLessThan(1e-12);
		}
	);
	it.each([0, 1, -0.1, 1.5, NaN])('rejects p = %f', (p) => {
		expect(() => inverseNormalCdf(p)).toThrow(/p must be in \(0, 1\)/);
	});
});
