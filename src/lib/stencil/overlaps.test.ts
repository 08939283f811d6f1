import { describe, expect, it } from 'vitest';
import { findApertureOverlaps, liesWithin } from './overlaps';
import { apertureGeometry } from './geometry';
import { circle, rect } from './test-fixtures';
import type { ApertureInput, PointUm } from './aperture';

const areas = (list: ApertureInput[]) => list.map((a) => apertureGeometry(a).areaUm2);

describe('findApertureOverlaps (first-principles areas)', () => {
	it('two 1 × 1 mm squares offset by 0.5 mm share 0.5 mm²; union 1.5 mm²', () => {
		const list = [rect(1000, 1000), rect(1000, 1000, { refdes: 'U2', xUm: 500 })];
		const r = findApertureOverlaps(list, areas(list));
		expect(r.pairs).toHaveLength(1);
		expect(r.pairs[0]).toMatchObject({ a: 0, b: 1 });
		expect(r.pairs[0].areaUm2).toBeCloseTo(500_000, 3);
		expect(r.sumAreaUm2).toBeCloseTo(2_000_000, 6);
		expect(r.unionAreaUm2).toBeCloseTo(1_500_000, 3);
		expect(r.complete).toBe(true);
	});

	it('adjacent pads that only touch along an edge do not overlap; the union is the sum', () => {
		const list = [rect(1000, 500), rect(1000, 500, { xUm: 1000 }), circle(300, { xUm: 5000 })];
		const r = findApertureOverlaps(list, areas(list));
		expect(r.pairs).toEqual([]);
		expect(r.unionAreaUm2).toBe(r.sumAreaUm2);
	});

	it('a circle of diameter 0.5 mm inside a 1 mm square: union is the square, exactly', () => {
		const list = [rect(1000, 1000), circle(500, { xUm: 100 })];
		const r = findApertureOverlaps(list, areas(list));
		expect(r.pairs).toHaveLength(1);
		expect(r.unionAreaUm2).toBeCloseTo(1_000_000, 2);
		// Sum counts the circle again: π·250² = 196,349.5 µm² too much.
		expect(r.sumAreaUm2 - r.unionAreaUm2).toBeCloseTo(Math.PI * 250 ** 2, 0);
	});

	it('a chain of three overlapping pads is one group, united once', () => {
		const list = [0, 800, 1600].map((x) => rect(1000, 1000, { xUm: x }));
		const r = findApertureOverlaps(list, areas(list));
		expect(r.pairs.map((p) => [p.a, p.b])).toEqual([
			[0, 1],
			[1, 2]
		]);
		// 2.6 mm × 1 mm.
		expect(r.unionAreaUm2).toBeCloseTo(2_600_000, 3);
	});

	it('stops, saying so, when openings piled on one spot exceed the pair-test budget', () => {
		const list = Array.from({ length: 200 }, () => rect(1000, 1000));
		const r = findApertureOverlaps(list, areas(list), {
			maxPairTests: 1000,
			maxCellsFiled: 1e6,
			maxPairs: 1e4,
			maxGroupSize: 500
		});
		expect(r.complete).toBe(false);
		expect(r.note).toContain('1,000 box tests');
	});

	it('finds the one overlap among 20,000 separate pads (grid, not all pairs)', () => {
		const list: ApertureInput[] = [];
		for (let k = 0; k < 20_000; k++)
			list.push(rect(500, 300, { xUm: (k % 200) * 1000, yUm: Math.floor(k / 200) * 1000 }));
		list.push(rect(500, 300, { xUm: 250 }));
		const r = findApertureOverlaps(list, areas(list));
		expect(r.pairs).toEqual([{ a: 0, b: 20_000, areaUm2: expect.closeTo(250 * 300, 3) }]);
		expect(r.complete).toBe(true);
	});
});

describe('liesWithin', () => {
	const sq = (h: number, x = 0): PointUm[] => [
		[x - h, -h],
		[x + h, -h],
		[x + h, h],
		[x - h, h]
	];
	it('a small square in a large one, but not one that sticks out', () => {
		expect(liesWithin(sq(1), sq(3))).toBe(true);
		expect(liesWithin(sq(1, 2.5), sq(3))).toBe(false);
	});
});
