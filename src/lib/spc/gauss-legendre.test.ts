import { describe, it, expect } from 'vitest';
import { gaussLegendre } from './gauss-legendre';

describe('gaussLegendre', () => {
	it('2-point rule has nodes ±1/√3 and weights 1 (A&S 25.4.29)', () => {
		const { nodes, weights } = gaussLegendre(2);
		expect(nodes[0]).toBeCloseTo(-1 / Math.sqrt(3), 15);
		expect(nodes[1]).toBeCloseTo(1 / Math.sqrt(3), 15);
		expect(weights).toEqual([expect.closeTo(1, 15), expect.closeTo(1, 15)]);
	});
	it('1-point rule is the midpoint rule', () => {
		const { nodes, weights } = gaussLegendre(1);
		expect(nodes[0]).toBeCloseTo(0, 15);
		expect(weights[0]).toBeCloseTo(2, 15);
	});
	it.each([3, 7, 10, 12])('m = %i integrates xᵏ exactly for k ≤ 2m − 1', (m) => {
		const { nodes, weights } = gaussLegendre(m);
		for (let k = 0; k <= 2 * m - 1; k++) {
			const exact = k % 2 === 1 ? 0 : 2 / (k + 1);
			const q = nodes.reduce((s, x, i) => s + weights[i] * x ** k, 0);
			expect(q).toBeCloseTo(exact, 13);
		}
	});
	it.each([0, 2.5, -1])('rejects m = %f', (m) => {
		expect(() => gaussLegendre(m)).toThrow(/integer ≥ 1/);
	});
});
