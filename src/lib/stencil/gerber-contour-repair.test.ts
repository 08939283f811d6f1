import { describe, expect, it } from 'vitest';
import type { PointUm } from './aperture';
import { CUT_IN_SLIT_UM, repairRegionContour } from './gerber-contour-repair';
import { importGerberPasteLayer } from './gerber-import';
import { apertureGeometry } from './geometry';
import { withLimits } from './limits';
import { findSelfIntersection, polygonAreaUm2 } from './polygon';

// Contours in mm (f = 1000 µm per mm); every area below is derived by hand, see
// reference/gerber/README.md ("Self-crossing contours") for the shapes in the corpus.
const MM = 1000;
const areaUm2 = (p: readonly PointUm[]) => polygonAreaUm2(p.map(([x, y]) => [x * MM, y * MM]));

describe('repairRegionContour', () => {
	it('leaves a simple contour alone', () => {
		expect(
			repairRegionContour(
				[
					[0, 0],
					[1, 0],
					[1, 1],
					[0, 1]
				],
				MM
			)
		).toEqual({ kind: 'simple' });
	});

	it('refuses a bow-tie (loops turning both ways), naming where it crosses', () => {
		// Edges (0,0)-(2,1) and (2,0)-(0,1) cross at (1, 0.5); lobes +0.5 and −0.5 mm².
		const r = repairRegionContour(
			[
				[0, 0],
				[2, 1],
				[2, 0],
				[0, 1]
			],
			MM
		);
		expect(r.kind).toBe('refused');
		if (r.kind !== 'refused') return;
		expect(r.at).toEqual([1, 0.5]);
		expect(r.reason).toContain('net area 0.0000 mm² against 1.0000 mm² enclosed');
	});

	it('unites a loop lying over itself into one simple polygon (nonzero winding)', () => {
		// Net (shoelace) 13 mm², of which [1,3]×[1,2] = 2 mm² is covered twice: filled 11 mm².
		const loop: PointUm[] = [
			[0, 0],
			[4, 0],
			[4, 3],
			[1, 3],
			[1, 1],
			[3, 1],
			[3, 2],
			[0, 2]
		];
		const r = repairRegionContour(loop, MM);
		expect(r.kind).toBe('repaired');
		if (r.kind !== 'repaired') return;
		expect(r.crossed).toBe(true);
		expect(r.at).toEqual([1, 2]);
		expect(r.pieces).toHaveLength(1);
		expect(findSelfIntersection(r.pieces[0])).toBeNull();
		expect(areaUm2(r.pieces[0])).toBeCloseTo(11e6, 3);
	});

	it('keeps the hole of a valid cut-in (specification 4.10.4.8) as one simple polygon', () => {
		// 10 × 10 mm square less the diamond of diagonals 8 and 8 mm (32 mm²): 68 mm²; the slit
		// runs 1 mm (1000 µm) through material from the hole's left vertex (1, 5) to x = 0.
		const cutIn: PointUm[] = [
			[0, 5],
			[0, 10],
			[10, 10],
			[10, 0],
			[0, 0],
			[0, 5],
			[1, 5],
			[5, 1],
			[9, 5],
			[5, 9],
			[1, 5]
		];
		const r = repairRegionContour(cutIn, MM);
		expect(r.kind).toBe('repaired');
		if (r.kind !== 'repaired') return;
		expect(r.crossed).toBe(false);
		expect(r.holesJoined).toBe(1);
		expect(r.pieces).toHaveLength(1);
		expect(findSelfIntersection(r.pieces[0])).toBeNull();
		expect(areaUm2(r.pieces[0])).toBeCloseTo(68e6 - 1000 * CUT_IN_SLIT_UM, 3);
	});

	it('fills the hole of a cut-in wound the wrong way (4.10.4.7: it self-intersects)', () => {
		// Hole wound like the square: winding 2 inside it, net 100 + 32, filled 100 mm².
		const wrong: PointUm[] = [
			[0, 5],
			[0, 10],
			[10, 10],
			[10, 0],
			[0, 0],
			[0, 5],
			[1, 5],
			[5, 9],
			[9, 5],
			[5, 1],
			[1, 5]
		];
		const r = repairRegionContour(wrong, MM);
		expect(r.kind).toBe('repaired');
		if (r.kind !== 'repaired') return;
		expect(r.crossed).toBe(true);
		expect(r.holesJoined).toBe(0);
		expect(r.pieces).toHaveLength(1);
		expect(areaUm2(r.pieces[0])).toBeCloseTo(100e6, 3);
	});

	it('splits two same-way loops touching at a corner into two openings', () => {
		const r = repairRegionContour(
			[
				[0, 0],
				[1, 0],
				[1, 1],
				[2, 1],
				[2, 2],
				[1, 2],
				[1, 1],
				[0, 1]
			],
			MM
		);
		expect(r.kind).toBe('repaired');
		if (r.kind !== 'repaired') return;
		expect(r.crossed).toBe(false);
		expect(r.at).toEqual([1, 1]);
		expect(r.pieces.map(areaUm2).sort()).toEqual([1e6, 1e6]);
	});
});

describe('importGerberPasteLayer: self-crossing contours of any size', () => {
	// The self-overlapping loop of the corpus with each edge cut into 400 collinear pieces: 3,200
	// vertices (the old check stopped at 2,000 and only warned). Still 11 mm², one opening.
	const loop: PointUm[] = [
		[0, 0],
		[4, 0],
		[4, 3],
		[1, 3],
		[1, 1],
		[3, 1],
		[3, 2],
		[0, 2]
	];
	const dense: PointUm[] = [];
	loop.forEach((a, i) => {
		const b = loop[(i + 1) % loop.length];
		for (let k = 0; k < 400; k++)
			dense.push([a[0] + ((b[0] - a[0]) * k) / 400, a[1] + ((b[1] - a[1]) * k) / 400]);
	});
	const coord = (v: number) => Math.round(v * 1e6);
	const body = dense.slice(1).map(([x, y]) => `X${coord(x)}Y${coord(y)}D01*`);
	const text = [
		'%FSLAX26Y26*%',
		'%MOMM*%',
		'G01*',
		'G36*',
		`X${coord(dense[0][0])}Y${coord(dense[0][1])}D02*`,
		...body,
		'X0Y0D01*',
		'G37*',
		'M02*'
	].join('\n');

	it('repairs a 3,200-vertex crossing contour into one opening of 11 mm²', () => {
		const result = importGerberPasteLayer(text, {
			limits: withLimits({ maxOutlineVertices: 5000 })
		});
		expect('errors' in result ? result.errors : []).toEqual([]);
		if ('errors' in result) return;
		expect(result.apertures).toHaveLength(1);
		expect(apertureGeometry(result.apertures[0]).areaUm2).toBeCloseTo(11e6, 0);
		expect(result.warnings.join('\n')).toContain(
			'line 4, G36 contour 1: contour crossed itself at (1, 2) mm; repaired into 1 opening(s)'
		);
	});
});

describe('self-crossing contours: work counted before the repair', () => {
	/** A star polygon {n/k} of radius 5 mm about (cx, 0) as a G36 region (n(k − 1) crossings). */
	const star = (n: number, k: number, cx: number) => {
		const pts = Array.from({ length: n }, (_, i) => {
			const a = (2 * Math.PI * ((i * k) % n)) / n;
			return `X${Math.round((cx + 5 * Math.cos(a)) * 1e6)}Y${Math.round(5 * Math.sin(a) * 1e6)}`;
		});
		return [
			'G36*',
			`${pts[0]}D02*`,
			...pts.slice(1).map((p) => `${p}D01*`),
			`${pts[0]}D01*`,
			'G37*'
		];
	};
	const layer = (...regions: string[][]) =>
		[
			'%FSLAX36Y36*%',
			'%MOMM*%',
			'%ADD10C,0.5*%',
			'G01*',
			...regions.flat(),
			'D10*',
			'X0Y20000000D03*',
			'M02*'
		].join('\n');

	it('refuses a contour crossing itself more than 1,000 times (a 999-point star {999/499}: 999 × 498 = 497,502), not the file', () => {
		const result = importGerberPasteLayer(layer(star(999, 499, 0)));
		expect('errors' in result ? result.errors : []).toEqual([]);
		if ('errors' in result) return;
		expect(result.apertures).toHaveLength(1); // the flash
		expect(result.warnings.join('\n')).toContain('its edges cross or touch more than 1,000 times');
	});

	it('refuses the layer (413) past 10,000 repaired crossings: 11 stars {499/3} of 499 × 2 = 998 each', () => {
		const regions = Array.from({ length: 11 }, (_, i) => star(499, 3, i * 20));
		const result = importGerberPasteLayer(layer(...regions));
		expect('errors' in result).toBe(true);
		if (!('errors' in result)) return;
		expect(result.overBudget).toBe(true);
		expect(result.errors.map((e) => e.message).join('\n')).toContain(
			'cross themselves more than 10,000 times; the limit is 10,000 repaired crossings per layer'
		);
	});
});
