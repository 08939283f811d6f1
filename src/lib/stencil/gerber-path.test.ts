import { describe, it, expect } from 'vitest';
import { arcSegmentCount, flattenGerberPath } from './gerber-path';
import type { GerberPathSegment } from './gerber-types';

// Sagitta of a chord spanning θ on a circle of radius r: s = r(1 − cos(θ/2)) (first principles).
const sagitta = (r: number, theta: number) => r * (1 - Math.cos(theta / 2));

function shoelace(points: [number, number][]): number {
	let twice = 0;
	for (let i = 0; i < points.length; i++) {
		const [x1, y1] = points[i];
		const [x2, y2] = points[(i + 1) % points.length];
		twice += x1 * y2 - x2 * y1;
	}
	return twice / 2;
}

describe('arcSegmentCount', () => {
	const cases = [
		{ r: 1000, sweep: 2 * Math.PI, tol: 0.5 },
		{ r: 500, sweep: Math.PI, tol: 0.5 },
		{ r: 100, sweep: Math.PI / 2, tol: 0.5 },
		{ r: 0.5, sweep: 2 * Math.PI, tol: 0.0005 },
		{ r: 5000, sweep: 0.3, tol: 0.1 }
	];
	for (const { r, sweep, tol } of cases) {
		it(`r = ${r}, sweep = ${sweep.toFixed(3)} rad, tol = ${tol}: the fewest chords with sagitta ≤ tol`, () => {
			const n = arcSegmentCount(r, sweep, tol);
			expect(sagitta(r, sweep / n)).toBeLessThanOrEqual(tol * (1 + 1e-9));
			if (n > 1) expect(sagitta(r, sweep / (n - 1))).toBeGreaterThan(tol);
		});
	}

	it('keeps at least 8 chords per turn when the tolerance is coarse (tol ≥ r)', () => {
		expect(arcSegmentCount(1, 2 * Math.PI, 5)).toBe(8);
		expect(arcSegmentCount(1, Math.PI / 2, 5)).toBe(2);
	});

	it('caps at 1024 chords per turn for a tiny tolerance', () => {
		expect(arcSegmentCount(1e6, 2 * Math.PI, 1e-9)).toBe(1024);
	});

	it('gives one chord for a very short arc', () => {
		expect(arcSegmentCount(1000, 1e-6, 0.5)).toBe(1);
	});

	const bad: [string, number, number, number][] = [
		['zero radius', 0, 1, 0.5],
		['negative sweep', 1, -1, 0.5],
		['NaN tolerance', 1, 1, Number.NaN],
		['infinite radius', Infinity, 1, 0.5]
	];
	for (const [name, r, s, t] of bad) {
		it(`throws a RangeError on ${name}`, () => {
			expect(() => arcSegmentCount(r, s, t)).toThrow(RangeError);
		});
	}
});

const line = (a: [number, number], b: [number, number]): GerberPathSegment => ({
	type: 'line',
	start: a,
	end: b
});

describe('flattenGerberPath', () => {
	it('returns no contours for an empty path', () => {
		expect(flattenGerberPath([], 0.001)).toEqual([]);
	});

	it('closes a square and drops the repeated first vertex', () => {
		const square = flattenGerberPath(
			[line([0, 0], [1, 0]), line([1, 0], [1, 1]), line([1, 1], [0, 1]), line([0, 1], [0, 0])],
			0.001
		);
		expect(square).toEqual([
			{
				vertices: [
					[0, 0],
					[1, 0],
					[1, 1],
					[0, 1]
				],
				closed: true
			}
		]);
	});

	it('starts a new contour where a segment does not continue the previous one (a D02 move)', () => {
		const two = flattenGerberPath(
			[
				line([0, 0], [1, 0]),
				line([1, 0], [0, 1]),
				line([0, 1], [0, 0]),
				line([5, 0], [6, 0]),
				line([6, 0], [5, 1]),
				line([5, 1], [5, 0])
			],
			0.001
		);
		expect(two.map((c) => c.vertices.length)).toEqual([3, 3]);
		expect(two.every((c) => c.closed)).toBe(true);
	});

	it('marks a contour that does not return to its start as open', () => {
		const open = flattenGerberPath([line([0, 0], [1, 0]), line([1, 0], [1, 1])], 0.001);
		expect(open).toEqual([
			{
				vertices: [
					[0, 0],
					[1, 0],
					[1, 1]
				],
				closed: false
			}
		]);
	});

	it('flattens a full counter-clockwise circle onto the circle, area within r·2π·tol of πr²', () => {
		const r = 0.5;
		const tol = 0.0005;
		const circle: GerberPathSegment = {
			type: 'arc',
			start: [1, 0, 0],
			end: [1, 0, 0],
			center: [0.5, 0],
			sweep: 2 * Math.PI,
			radius: r,
			dir: 'ccw'
		};
		const [c] = flattenGerberPath([circle], tol);
		expect(c.closed).toBe(true);
		for (const [x, y] of c.vertices) expect(Math.hypot(x - 0.5, y)).toBeCloseTo(r, 12);
		const area = shoelace(c.vertices);
		// Positive shoelace: counter-clockwise. Chords lose at most sagitta × arc length.
		expect(area).toBeLessThanOrEqual(Math.PI * r * r);
		expect(area).toBeGreaterThanOrEqual(Math.PI * r * r - tol * 2 * Math.PI * r);
	});

	it('runs a clockwise arc the other way round (quarter circle from (1,0) to (0,-1) about the origin)', () => {
		const arc: GerberPathSegment = {
			type: 'arc',
			start: [1, 0, 0],
			end: [0, -1, (3 * Math.PI) / 2],
			center: [0, 0],
			sweep: Math.PI / 2,
			radius: 1,
			dir: 'cw'
		};
		const [c] = flattenGerberPath([arc], 0.01);
		expect(c.vertices[c.vertices.length - 1]).toEqual([0, -1]);
		// Every intermediate point is in the fourth quadrant (x > 0, y < 0).
		for (const [x, y] of c.vertices.slice(1, -1)) {
			expect(x).toBeGreaterThan(0);
			expect(y).toBeLessThan(0);
		}
	});

	it('throws on a non-positive tolerance', () => {
		expect(() => flattenGerberPath([], 0)).toThrow(/tolerance must be a positive number/);
	});
});
