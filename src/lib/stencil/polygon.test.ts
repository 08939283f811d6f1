import { describe, it, expect } from 'vitest';
import type { PointUm } from './aperture';
import {
	convexHull,
	findSelfIntersection,
	openPolygon,
	polygonAreaUm2,
	polygonCentroid,
	polygonPerimeterUm,
	polygonSignedArea
} from './polygon';

const square: PointUm[] = [[0, 0], [2, 0], [2, 2], [0, 2]];

describe('shoelace area and perimeter (first principles)', () => {
	const cases: { name: string; v: PointUm[]; area: number; perimeter: number }[] = [
		{ name: '3-4-5 triangle', v: [[0, 0], [3, 0], [0, 4]], area: 6, perimeter: 12 },
		{ name: 'unit square', v: [[0, 0], [1, 0], [1, 1], [0, 1]], area: 1, perimeter: 4 },
		{ name: 'L shape 2×2 minus 1×1', v: [[0, 0], [2, 0], [2, 1], [1, 1], [1, 2], [0, 2]], area: 3, perimeter: 8 }
	];
	for (const c of cases)
		it(c.name, () => {
			expect(polygonAreaUm2(c.v)).toBeCloseTo(c.area, 12);
			expect(polygonAreaUm2([...c.v].reverse())).toBeCloseTo(c.area, 12);
			expect(polygonPerimeterUm(c.v)).toBeCloseTo(c.perimeter, 12);
		});
	it('signed area: counter-clockwise positive, clockwise negative', () => {
		expect(polygonSignedArea(square)).toBe(4);
		expect(polygonSignedArea([...square].reverse())).toBe(-4);
	});
});

describe('openPolygon', () => {
	it('drops a repeated closing vertex, keeps others', () => {
		expect(openPolygon([...square, [0, 0]])).toEqual(square);
		expect(openPolygon(square)).toEqual(square);
		expect(openPolygon([])).toEqual([]);
	});
});

describe('polygonCentroid', () => {
	it('square centre', () => expect(polygonCentroid(square)).toEqual([1, 1]));
	it('triangle: mean of the vertices', () => {
		const c = polygonCentroid([[0, 0], [3, 0], [0, 6]]);
		expect(c[0]).toBeCloseTo(1, 12);
		expect(c[1]).toBeCloseTo(2, 12);
	});
	it('zero area throws', () => expect(() => polygonCentroid([[0, 0], [1, 0], [2, 0]])).toThrow(/zero area/));
});

describe('convexHull', () => {
	it('removes interior and collinear points', () => {
		const h = convexHull([[0, 0], [1, 0], [2, 0], [2, 2], [1, 1], [0, 2]]);
		expect(h).toHaveLength(4);
		expect(polygonSignedArea(h)).toBe(4);
	});
	it('fewer than 3 points are returned as they are', () => expect(convexHull([[1, 1]])).toEqual([[1, 1]]));
});

describe('findSelfIntersection', () => {
	const cases: { name: string; v: PointUm[]; hit: boolean }[] = [
		{ name: 'square is simple', v: square, hit: false },
		{ name: 'concave L is simple', v: [[0, 0], [2, 0], [2, 1], [1, 1], [1, 2], [0, 2]], hit: false },
		{ name: 'bow tie crosses', v: [[0, 0], [2, 2], [2, 0], [0, 2]], hit: true },
		{ name: 'vertex touching a non-adjacent edge', v: [[0, 0], [4, 0], [4, 4], [2, 0], [0, 4]], hit: true },
		{ name: 'spike doubling back on its neighbour', v: [[0, 0], [3, 0], [1, 0], [1, 2]], hit: true },
		{ name: 'triangle is simple', v: [[0, 0], [1, 0], [0, 1]], hit: false }
	];
	for (const c of cases) it(c.name, () => expect(findSelfIntersection(c.v) !== null).toBe(c.hit));
});
