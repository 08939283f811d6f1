import { describe, it, expect } from 'vitest';
import examples from '../../../reference/stencil/worked-examples.json';
import { apertureBoundsUm, apertureCentreUm, apertureOutlineUm, apertureSvgPath } from './outline';
import { polygonAreaUm2, polygonPerimeterUm } from './polygon';
import { apertureGeometry } from './geometry';
import { circle, polygon, rect } from './test-fixtures';

describe('chord outline of a rounded rectangle converges to the exact formulas (first principles)', () => {
	for (const c of examples.roundedRectangle.cases) {
		it(`${c.lengthUm}×${c.widthUm} r=${c.cornerRadiusUm}`, () => {
			const a = rect(c.lengthUm, c.widthUm, { cornerRadiusUm: c.cornerRadiusUm });
			let prevErr = Infinity;
			for (const n of [2, 4, 8, 16, 32, 64]) {
				const pts = apertureOutlineUm(a, n);
				const area = polygonAreaUm2(pts);
				const err = c.areaUm2 - area;
				// Inscribed chords: area from below, error 2r²(θ − sin θ)n with θ = π/(2n).
				const theta = Math.PI / (2 * n);
				const r = c.cornerRadiusUm;
				expect(err).toBeCloseTo(4 * ((r * r) / 2) * (theta - Math.sin(theta)) * n, 6);
				expect(err).toBeGreaterThan(0);
				expect(err).toBeLessThan(prevErr);
				prevErr = err;
			}
			const fine = apertureOutlineUm(a, 256);
			expect(polygonPerimeterUm(fine) / c.perimeterUm).toBeCloseTo(1, 5);
		});
	}
	it('a plain rectangle outline is its 4 corners, exactly', () => {
		expect(apertureOutlineUm(rect(2, 1))).toEqual([
			[1, -0.5],
			[1, 0.5],
			[-1, 0.5],
			[-1, -0.5]
		]);
	});
});

describe('placement: position and counter-clockwise rotation', () => {
	it('90° turns the long side vertical', () => {
		const b = apertureBoundsUm(rect(1000, 200, { xUm: 5000, yUm: 1000, rotationDeg: 90 }));
		expect(b.xMinUm).toBeCloseTo(4900, 9);
		expect(b.xMaxUm).toBeCloseTo(5100, 9);
		expect(b.yMinUm).toBeCloseTo(500, 9);
		expect(b.yMaxUm).toBeCloseTo(1500, 9);
	});
	it('rounded rectangle bounds at 30° equal the bounds of a fine chord outline', () => {
		const a = rect(1000, 300, { cornerRadiusUm: 100, rotationDeg: 30, xUm: -200, yUm: 700 });
		const b = apertureBoundsUm(a);
		const pts = apertureOutlineUm(a, 2000);
		expect(Math.max(...pts.map((p) => p[0]))).toBeCloseTo(b.xMaxUm, 2);
		expect(Math.min(...pts.map((p) => p[1]))).toBeCloseTo(b.yMinUm, 2);
	});
	it('circle bounds ignore rotation', () => {
		expect(apertureBoundsUm(circle(500, { xUm: 1000, rotationDeg: 17 }))).toEqual({
			xMinUm: 750,
			yMinUm: -250,
			xMaxUm: 1250,
			yMaxUm: 250
		});
	});
	it('polygon vertices are relative to the position and turn with it', () => {
		const b = apertureBoundsUm(
			polygon(
				[
					[0, 0],
					[100, 0],
					[0, 50]
				],
				{ xUm: 10, yUm: 20, rotationDeg: 180 }
			)
		);
		expect(b.xMinUm).toBeCloseTo(-90, 9);
		expect(b.xMaxUm).toBeCloseTo(10, 9);
		expect(b.yMinUm).toBeCloseTo(-30, 9);
		expect(b.yMaxUm).toBeCloseTo(20, 9);
	});
	it('placed outline keeps the area (rotation is rigid)', () => {
		const a = polygon(examples.laskyOddShape.verticesMil as [number, number][], {
			rotationDeg: 47,
			xUm: 3,
			yUm: -8
		});
		expect(polygonAreaUm2(apertureOutlineUm(a))).toBeCloseTo(apertureGeometry(a).areaUm2, 9);
	});
	it('centre: rectangles at (x, y); polygons at the placed area centroid', () => {
		expect(apertureCentreUm(rect(10, 10, { xUm: 3, yUm: 4 }))).toEqual([3, 4]);
		const c = apertureCentreUm(
			polygon(
				[
					[0, 0],
					[2, 0],
					[2, 2],
					[0, 2]
				],
				{ xUm: 10, rotationDeg: 90 }
			)
		);
		expect(c[0]).toBeCloseTo(9, 9);
		expect(c[1]).toBeCloseTo(1, 9);
	});
});

describe('apertureSvgPath', () => {
	it('rectangle', () => expect(apertureSvgPath(rect(2, 1))).toBe('M1 -0.5L1 0.5L-1 0.5L-1 -0.5Z'));
	it('circle: two half arcs of radius D/2', () =>
		expect(apertureSvgPath(circle(500, { xUm: 1000 }))).toBe(
			'M1250 0A250 250 0 1 1 750 0A250 250 0 1 1 1250 0Z'
		));
	it('rounded rectangle: four straight sides and four quarter arcs', () => {
		const d = apertureSvgPath(rect(1000, 300, { cornerRadiusUm: 100 }));
		expect(d.match(/A100 100 0 0 1/g)?.length).toBe(4);
		expect(d.startsWith('M500 -50L500 50A100 100 0 0 1 400 150')).toBe(true);
	});
	it('polygon', () =>
		expect(
			apertureSvgPath(
				polygon(
					[
						[0, 0],
						[3, 0],
						[0, 4]
					],
					{ xUm: 1 }
				)
			)
		).toBe('M1 0L4 0L1 4Z'));
	it('invalid aperture throws instead of drawing garbage', () =>
		expect(() => apertureSvgPath(rect(NaN, 1))).toThrow(/lengthUm: must be a finite number/));
});
