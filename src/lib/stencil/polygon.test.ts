import { describe, it, expect } from 'vitest';
import type { PointUm } from './aperture';
import {
	convexHull,
	findSelfIntersection,
	openPolygon,
	polygonAreaUm2,
	polygonCentroid,
	polygonMinWidthUm,
	polygonPerimeterUm,
	polygonSignedArea
} from './polygon';

const square: PointUm[] = [
	[0, 0],
	[2, 0],
	[2, 2],
	[0, 2]
];

describe('shoelace area and perimeter (first principles)', () => {
	const cases: { name: string; v: PointUm[]; area: number; perimeter: number }[] = [
		{
			name: '3-4-5 triangle',
			v: [
				[0, 0],
				[3, 0],
				[0, 4]
			],
			area: 6,
			perimeter: 12
		},
		{
			name: 'unit square',
			v: [
				[0, 0],
				[1, 0],
				[1, 1],
				[0, 1]
			],
			area: 1,
			perimeter: 4
		},
		{
			name: 'L shape 2×2 minus 1×1',
			v: [
				[0, 0],
				[2, 0],
				[2, 1],
				[1, 1],
				[1, 2],
				[0, 2]
			],
			area: 3,
			perimeter: 8
		}
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
		const c = polygonCentroid([
			[0, 0],
			[3, 0],
			[0, 6]
		]);
		expect(c[0]).toBeCloseTo(1, 12);
		expect(c[1]).toBeCloseTo(2, 12);
	});
	it('zero area throws', () =>
		expect(() =>
			polygonCentroid([
				[0, 0],
				[1, 0],
				[2, 0]
			])
		).toThrow(/zero area/));
});

describe('convexHull', () => {
	it('removes interior and collinear points', () => {
		const h = convexHull([
			[0, 0],
			[1, 0],
			[2, 0],
			[2, 2],
			[1, 1],
			[0, 2]
		]);
		expect(h).toHaveLength(4);
		expect(polygonSignedArea(h)).toBe(4);
	});
	it('fewer than 3 points are returned as they are', () =>
		expect(convexHull([[1, 1]])).toEqual([[1, 1]]));
});

describe('findSelfIntersection', () => {
	const cases: { name: string; v: PointUm[]; hit: boolean }[] = [
		{ name: 'square is simple', v: square, hit: false },
		{
			name: 'concave L is simple',
			v: [
				[0, 0],
				[2, 0],
				[2, 1],
				[1, 1],
				[1, 2],
				[0, 2]
			],
			hit: false
		},
		{
			name: 'bow tie crosses',
			v: [
				[0, 0],
				[2, 2],
				[2, 0],
				[0, 2]
			],
			hit: true
		},
		{
			name: 'vertex touching a non-adjacent edge',
			v: [
				[0, 0],
				[4, 0],
				[4, 4],
				[2, 0],
				[0, 4]
			],
			hit: true
		},
		{
			name: 'spike doubling back on its neighbour',
			v: [
				[0, 0],
				[3, 0],
				[1, 0],
				[1, 2]
			],
			hit: true
		},
		{
			name: 'triangle is simple',
			v: [
				[0, 0],
				[1, 0],
				[0, 1]
			],
			hit: false
		}
	];
	for (const c of cases) it(c.name, () => expect(findSelfIntersection(c.v) !== null).toBe(c.hit));
});

// Cross-checks of the fast algorithms against the plain definitions on random point sets:
// every edge pair tested, and every hull vertex measured from every hull edge.
function cross(o: PointUm, a: PointUm, b: PointUm) {
	return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0]);
}
function touches(a: PointUm, b: PointUm, c: PointUm, d: PointUm) {
	const on = (p: PointUm, q: PointUm, r: PointUm) =>
		Math.min(p[0], q[0]) <= r[0] &&
		r[0] <= Math.max(p[0], q[0]) &&
		Math.min(p[1], q[1]) <= r[1] &&
		r[1] <= Math.max(p[1], q[1]);
	const [d1, d2, d3, d4] = [cross(c, d, a), cross(c, d, b), cross(a, b, c), cross(a, b, d)].map(
		Math.sign
	);
	return (
		(d1 * d2 < 0 && d3 * d4 < 0) ||
		(d1 === 0 && on(c, d, a)) ||
		(d2 === 0 && on(c, d, b)) ||
		(d3 === 0 && on(a, b, c)) ||
		(d4 === 0 && on(a, b, d))
	);
}
function everyPairCrossing(v: PointUm[]): boolean {
	const n = v.length;
	for (let i = 0; i < n; i++) {
		const [a, b, c] = [v[i], v[(i + 1) % n], v[(i + 2) % n]];
		if (cross(a, b, c) === 0 && (b[0] - a[0]) * (c[0] - b[0]) + (b[1] - a[1]) * (c[1] - b[1]) < 0)
			return true;
		for (let j = i + 2; j < n; j++)
			if (!(i === 0 && j === n - 1) && touches(a, b, v[j], v[(j + 1) % n])) return true;
	}
	return false;
}
function widthByEveryPair(v: PointUm[]): number {
	const hull = convexHull(v);
	let best = Infinity;
	for (let i = 0; i < hull.length; i++) {
		const [a, b] = [hull[i], hull[(i + 1) % hull.length]];
		let far = 0;
		for (const p of hull)
			far = Math.max(far, Math.abs(cross(a, b, p)) / Math.hypot(b[0] - a[0], b[1] - a[1]));
		best = Math.min(best, far);
	}
	return best;
}

describe('fast polygon checks agree with the definitions', () => {
	let seed = 7;
	const random = () => (seed = (seed * 16807) % 2147483647) / 2147483647;
	const sets: PointUm[][] = [];
	for (let t = 0; t < 1500; t++) {
		const n = 3 + Math.floor(random() * 25);
		const v: PointUm[] = [];
		// Small integer grids make touching, collinear and repeated points common.
		const span = t % 3 === 0 ? 6 : 100;
		for (let k = 0; k < n; k++) v.push([Math.round(random() * span), Math.round(random() * span)]);
		sets.push(v);
	}
	it('findSelfIntersection finds a crossing exactly when some edge pair crosses', () => {
		let crossing = 0;
		for (const v of sets) {
			const expected = everyPairCrossing(v);
			if (expected) crossing++;
			expect(findSelfIntersection(v) !== null).toBe(expected);
		}
		expect(crossing).toBeGreaterThan(100);
		expect(crossing).toBeLessThan(sets.length);
	});
	it('polygonMinWidthUm (rotating calipers) equals the width over every hull edge and vertex', () => {
		for (const v of sets) expect(polygonMinWidthUm(v)).toBeCloseTo(widthByEveryPair(v), 9);
	});
	it('a regular 1,000-gon: width is twice the apothem, and it is simple', () => {
		const n = 1000;
		const v: PointUm[] = Array.from({ length: n }, (_, k) => [
			1000 * Math.cos((2 * Math.PI * k) / n),
			1000 * Math.sin((2 * Math.PI * k) / n)
		]);
		expect(findSelfIntersection(v)).toBeNull();
		expect(polygonMinWidthUm(v)).toBeCloseTo(2 * 1000 * Math.cos(Math.PI / n), 6);
	});
});
