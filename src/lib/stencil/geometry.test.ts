import { describe, it, expect } from 'vitest';
import examples from '../../../reference/stencil/worked-examples.json';
import { toMicrometres } from '../units';
import type { PointUm } from './aperture';
import { apertureGeometry } from './geometry';
import { areaRatio } from './area-ratio';
import { StencilInputError } from './stencil-input-error';
import { circle, polygon, rect } from './test-fixtures';

describe('apertureGeometry: rectangles (issue examples, first principles)', () => {
	for (const c of examples.issueExamples.cases) {
		it(c.name, () => {
			const g = apertureGeometry(rect(c.lengthUm, c.widthUm));
			expect(g.areaUm2).toBe(c.areaUm2);
			expect(g.perimeterUm).toBe(c.perimeterUm);
			expect(g.minDimensionUm).toBe(Math.min(c.lengthUm, c.widthUm));
		});
	}
});

describe('apertureGeometry: rounded rectangles (first principles, stadium cross-check)', () => {
	for (const c of examples.roundedRectangle.cases) {
		it(`${c.lengthUm}×${c.widthUm} r=${c.cornerRadiusUm}`, () => {
			const g = apertureGeometry(
				rect(c.lengthUm, c.widthUm, {
					shape: 'rounded-rectangle',
					cornerRadiusUm: c.cornerRadiusUm
				})
			);
			expect(g.areaUm2).toBeCloseTo(c.areaUm2, 5);
			expect(g.perimeterUm).toBeCloseTo(c.perimeterUm, 5);
		});
	}
	it('shape "rectangle" with a corner radius is computed as rounded (JSON API spelling)', () => {
		const a = apertureGeometry(rect(1000, 300, { cornerRadiusUm: 100 }));
		const b = apertureGeometry(
			rect(1000, 300, { shape: 'rounded-rectangle', cornerRadiusUm: 100 })
		);
		expect(a).toEqual(b);
		expect(a.areaUm2).toBeLessThan(300000);
	});
	it('r = L/2 = W/2 equals a circle of that diameter', () => {
		const rr = apertureGeometry(rect(400, 400, { cornerRadiusUm: 200 }));
		const c = apertureGeometry(circle(400));
		expect(rr.areaUm2).toBeCloseTo(c.areaUm2, 6);
		expect(rr.perimeterUm).toBeCloseTo(c.perimeterUm, 6);
	});
	it('rounding the corners raises the area ratio (REFERENCE-FACTS e)', () => {
		const sharp = apertureGeometry(rect(300, 280));
		const round = apertureGeometry(rect(300, 280, { cornerRadiusUm: 60 }));
		expect(areaRatio(round.areaUm2, round.perimeterUm, 100)).toBeGreaterThan(
			areaRatio(sharp.areaUm2, sharp.perimeterUm, 100)
		);
	});
});

describe('circle and square of the same size have the same area ratio D/(4T)', () => {
	for (const c of examples.circleEqualsSquare.cases) {
		it(`${c.sizeUm} µm at ${c.thicknessUm} µm`, () => {
			const gc = apertureGeometry(circle(c.sizeUm));
			const gs = apertureGeometry(rect(c.sizeUm, c.sizeUm));
			expect(areaRatio(gc.areaUm2, gc.perimeterUm, c.thicknessUm)).toBeCloseTo(c.areaRatio, 12);
			expect(areaRatio(gs.areaUm2, gs.perimeterUm, c.thicknessUm)).toBeCloseTo(c.areaRatio, 12);
		});
	}
});

describe('Lasky odd-shaped aperture (polygon with the published area and perimeter)', () => {
	const ex = examples.laskyOddShape;
	it('in mil: A = 1138 mil², P = 168 mil, AR at 5 mil = 1.355', () => {
		const g = apertureGeometry(polygon(ex.verticesMil as PointUm[]));
		expect(g.areaUm2).toBeCloseTo(ex.areaMil2, 9);
		expect(g.perimeterUm).toBeCloseTo(ex.perimeterMil, 9);
		expect(areaRatio(g.areaUm2, g.perimeterUm, ex.thicknessMil)).toBeCloseTo(
			ex.publishedAreaRatio,
			3
		);
	});
	it('the same polygon in µm at 127 µm gives the same ratio (dimensionless)', () => {
		const um = ex.verticesMil.map(
			([x, y]) => [toMicrometres(x, 'mil'), toMicrometres(y, 'mil')] as PointUm
		);
		const g = apertureGeometry(polygon(um, { rotationDeg: 33, xUm: 5000 }));
		expect(areaRatio(g.areaUm2, g.perimeterUm, toMicrometres(ex.thicknessMil, 'mil'))).toBeCloseTo(
			1138 / 840,
			12
		);
	});
	it('reversed vertex order and a repeated closing vertex change nothing', () => {
		const v = ex.verticesMil as PointUm[];
		const a = apertureGeometry(polygon(v));
		const b = apertureGeometry(polygon([...v].reverse()));
		const c = apertureGeometry(polygon([...v, v[0]]));
		expect(b).toEqual(a);
		expect(c).toEqual(a);
	});
});

describe('polygon smallest dimension = minimum caliper width of the hull', () => {
	const cases: { name: string; v: PointUm[]; width: number }[] = [
		{
			name: 'axis rectangle 1000×200',
			v: [
				[0, 0],
				[1000, 0],
				[1000, 200],
				[0, 200]
			],
			width: 200
		},
		{
			name: '3-4-5 right triangle: height onto the hypotenuse 12/5',
			v: [
				[0, 0],
				[3, 0],
				[0, 4]
			],
			width: 2.4
		},
		{
			name: 'equilateral triangle side 2: height √3',
			v: [
				[0, 0],
				[2, 0],
				[1, Math.sqrt(3)]
			],
			width: Math.sqrt(3)
		},
		{
			name: 'regular hexagon side 1: flat-to-flat √3',
			v: Array.from(
				{ length: 6 },
				(_, k) => [Math.cos((k * Math.PI) / 3), Math.sin((k * Math.PI) / 3)] as PointUm
			),
			width: Math.sqrt(3)
		},
		// Hull (0,0),(100,0),(100,10),(10,100),(0,100): the caliper on edge x + y = 110 is the
		// narrowest, width 110/√2 ≈ 77.8, far from the 10-wide arms.
		{
			name: 'L shape: hull width, not the 10-wide arm (documented approximation)',
			v: [
				[0, 0],
				[100, 0],
				[100, 10],
				[10, 10],
				[10, 100],
				[0, 100]
			],
			width: 110 / Math.SQRT2
		}
	];
	for (const c of cases)
		it(c.name, () => {
			expect(apertureGeometry(polygon(c.v)).minDimensionUm).toBeCloseTo(c.width, 9);
		});
	it('a rotated rectangle given as a polygon still measures its short side', () => {
		const t = 0.4;
		const pts: PointUm[] = [
			[0, 0],
			[1000, 0],
			[1000, 200],
			[0, 200]
		].map(([x, y]) => [x * Math.cos(t) - y * Math.sin(t), x * Math.sin(t) + y * Math.cos(t)]);
		expect(apertureGeometry(polygon(pts)).minDimensionUm).toBeCloseTo(200, 9);
	});
});

describe('validation: bad input gives StencilInputError naming aperture and field', () => {
	const cases: { name: string; a: ReturnType<typeof rect>; field: string; text: RegExp }[] = [
		{ name: 'zero width', a: rect(1000, 0), field: 'widthUm', text: /greater than 0/ },
		{ name: 'negative length', a: rect(-5, 200), field: 'lengthUm', text: /greater than 0/ },
		{ name: 'NaN width', a: rect(1000, NaN), field: 'widthUm', text: /finite/ },
		{ name: 'Infinity diameter', a: circle(Infinity), field: 'diameterUm', text: /finite/ },
		{
			name: 'missing width',
			a: rect(1000, undefined as unknown as number),
			field: 'widthUm',
			text: /missing/
		},
		{
			name: 'absurd size (unit mistake)',
			a: rect(200_000, 200),
			field: 'lengthUm',
			text: /100 mm/
		},
		{
			name: 'corner radius over half the width',
			a: rect(1000, 200, { cornerRadiusUm: 101 }),
			field: 'cornerRadiusUm',
			text: /half/
		},
		{
			name: 'negative corner radius',
			a: rect(1000, 200, { cornerRadiusUm: -1 }),
			field: 'cornerRadiusUm',
			text: /negative/
		},
		{
			name: 'rounded-rectangle without radius',
			a: rect(1000, 200, { shape: 'rounded-rectangle' }),
			field: 'cornerRadiusUm',
			text: /needs/
		},
		{
			name: 'polygon with 2 vertices',
			a: polygon([
				[0, 0],
				[1, 1]
			]),
			field: 'verticesUm',
			text: /at least 3/
		},
		{
			name: 'self-intersecting bow tie',
			a: polygon([
				[0, 0],
				[200, 200],
				[200, 0],
				[0, 200]
			]),
			field: 'verticesUm',
			text: /intersects itself/
		},
		{
			name: 'spike doubling back',
			a: polygon([
				[0, 0],
				[200, 0],
				[100, 0],
				[100, 100]
			]),
			field: 'verticesUm',
			text: /intersects itself/
		},
		{
			name: 'collinear vertices (degenerate, closing edge overlaps)',
			a: polygon([
				[0, 0],
				[100, 0],
				[200, 0]
			]),
			field: 'verticesUm',
			text: /intersects itself/
		},
		{
			name: 'repeated vertex',
			a: polygon([
				[0, 0],
				[100, 0],
				[100, 0],
				[0, 100]
			]),
			field: 'verticesUm',
			text: /same point/
		},
		{
			name: 'vertex with NaN',
			a: polygon([
				[0, 0],
				[100, NaN],
				[0, 100]
			]),
			field: 'verticesUm[1]',
			text: /finite/
		},
		{
			name: 'unknown shape',
			a: rect(1, 1, { shape: 'triangle' as never }),
			field: 'shape',
			text: /unknown shape "triangle"/
		},
		{ name: 'NaN position', a: rect(1000, 200, { xUm: NaN }), field: 'xUm', text: /finite/ },
		{
			name: 'NaN rotation',
			a: rect(1000, 200, { rotationDeg: NaN }),
			field: 'rotationDeg',
			text: /finite/
		}
	];
	for (const c of cases)
		it(c.name, () => {
			let caught: unknown;
			try {
				apertureGeometry(c.a, 4);
			} catch (e) {
				caught = e;
			}
			expect(caught).toBeInstanceOf(StencilInputError);
			const err = caught as StencilInputError;
			const p = err.problems.find((q) => q.field === c.field);
			expect(p, err.message).toBeDefined();
			expect(p!.message).toMatch(c.text);
			expect(err.message).toContain(`${c.a.refdes}.${c.a.pad}, ${c.field}: `);
		});
	it('an unnamed aperture is located by its 1-based list position', () => {
		expect(() => apertureGeometry(rect(0, 1, { refdes: '', pad: '' }), 11)).toThrow(
			/^aperture #12, lengthUm:/
		);
	});
	it('all problems are listed, not only the first', () => {
		try {
			apertureGeometry(rect(-1, NaN, { xUm: Infinity }));
		} catch (e) {
			expect((e as StencilInputError).problems.map((p) => p.field).sort()).toEqual([
				'lengthUm',
				'widthUm',
				'xUm'
			]);
		}
		expect.assertions(1);
	});
	it('corner radius exactly half the width is an obround, accepted', () => {
		expect(apertureGeometry(rect(1000, 200, { cornerRadiusUm: 100 })).areaUm2).toBeCloseTo(
			800 * 200 + Math.PI * 100 ** 2,
			6
		);
	});
	it('the input is not mutated', () => {
		const v: PointUm[] = [
			[0, 0],
			[100, 0],
			[100, 100],
			[0, 0]
		];
		const a = polygon(v);
		const copy = structuredClone(a);
		apertureGeometry(a);
		expect(a).toEqual(copy);
	});
});
