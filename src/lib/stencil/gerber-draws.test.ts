import { describe, expect, it } from 'vitest';
import {
	drawnArcCentre,
	listLines,
	MAX_PAD_ELONGATION,
	strokeCapsule,
	strokeRectangle
} from './gerber-draws';
import {
	importGerberPasteLayer,
	type GerberImportResult,
	type GerberImportSuccess
} from './gerber-import';
import { apertureGeometry } from './geometry';
import { polygonAreaUm2, polygonPerimeterUm } from './polygon';
import { withLimits } from './limits';

const header = '%FSLAX26Y26*%\n%MOMM*%\n';

function ok(r: GerberImportResult): GerberImportSuccess {
	if ('errors' in r) throw new Error(JSON.stringify(r.errors));
	return r;
}

describe('stroke polygons (first principles)', () => {
	it('a round pen sweeps a capsule of area L·w + πw²/4, inscribed within the chord tolerance', () => {
		const poly = strokeCapsule([0, 0], [1000, 0], 200, 0.5);
		const exact = 1000 * 200 + (Math.PI * 200 ** 2) / 4;
		const area = polygonAreaUm2(poly);
		expect(area).toBeLessThanOrEqual(exact);
		expect(exact - area).toBeLessThanOrEqual(0.5 * polygonPerimeterUm(poly));
	});

	it('a draw of zero length leaves the pen disc, πd²/4', () => {
		const poly = strokeCapsule([5, 5], [5, 5], 100, 0.5);
		const exact = (Math.PI * 100 ** 2) / 4;
		expect(exact - polygonAreaUm2(poly)).toBeGreaterThanOrEqual(0);
		expect(exact - polygonAreaUm2(poly)).toBeLessThanOrEqual(0.5 * Math.PI * 100);
	});

	it('a square pen a × a drawn along (dx, dy) sweeps a² + a(|dx| + |dy|) (Minkowski sum)', () => {
		expect(polygonAreaUm2(strokeRectangle([0, 0], [1000, 0], 200, 200))).toBeCloseTo(240_000, 6);
		// Diagonal: 0.2² + 0.2 · (1 + 1) mm² = 0.44 mm².
		expect(polygonAreaUm2(strokeRectangle([0, 0], [1000, 1000], 200, 200))).toBeCloseTo(440_000, 6);
	});
});

describe('drawn arc centres', () => {
	it('multi quadrant (G75): the centre is the start plus (I, J)', () => {
		const c = drawnArcCentre({
			start: [1, 0],
			end: [0, 1],
			arc: { i: -1, j: 0, dir: 'ccw', quadrant: 'multi' }
		});
		expect(c).toEqual([0, 0]);
	});
	it('single quadrant (G74): unsigned I, J; the sign pair giving a ≤ 90° arc in the direction', () => {
		// Counter-clockwise from (1, 0) to (0, 1) about (0, 0): I = 1 taken as −1.
		const ccw = drawnArcCentre({
			start: [1, 0],
			end: [0, 1],
			arc: { i: 1, j: 0, dir: 'ccw', quadrant: 'single' }
		});
		expect(ccw[0]).toBeCloseTo(0, 12);
		expect(ccw[1]).toBeCloseTo(0, 12);
		// Clockwise from (1, 0) to (0, 1): the short way round is about (1, 1).
		const cw = drawnArcCentre({
			start: [1, 0],
			end: [0, 1],
			arc: { i: 0, j: 1, dir: 'cw', quadrant: 'single' }
		});
		expect(cw).toEqual([1, 1]);
	});
});

describe('importGerberPasteLayer: stroked pads', () => {
	it('a single stroke of pad size becomes a drawn polygon opening with area from its outline', () => {
		// Pen 0.25 mm from (0,0) to (1.25,0): capsule 1.25·0.25 + π·0.125² = 0.3615874 mm².
		const r = ok(
			importGerberPasteLayer(`${header}%ADD10C,0.25*%\nD10*\nX0Y0D02*\nG01X1250000D01*\nM02*\n`)
		);
		expect(r.apertures).toHaveLength(1);
		const a = r.apertures[0];
		expect(a.drawn).toBe(true);
		expect(a.shape).toBe('polygon');
		const g = apertureGeometry(a);
		const exact = 1250 * 250 + Math.PI * 125 ** 2;
		expect(g.areaUm2).toBeLessThanOrEqual(exact);
		expect(exact - g.areaUm2).toBeLessThanOrEqual(0.5 * g.perimeterUm);
		// Smallest width: the pen's diameter (the chords touch the circle at the sides).
		expect(g.minDimensionUm).toBeCloseTo(250, 3);
		expect(a.xUm).toBeCloseTo(625, 3);
		expect(a.yUm).toBeCloseTo(0, 3);
		expect(r.drawn).toEqual({ openings: 1, drawsUsed: 1, lineLikeIslands: 0 });
		expect(r.counts.drawsSkipped).toBe(0);
	});

	it('overlapping strokes are united into one island; separate ones stay separate', () => {
		// Two strokes crossing at (0.5, 0) and one 5 mm away.
		const body =
			'%ADD10C,0.2*%\nD10*\nX0Y0D02*\nG01X1000000D01*\nX500000Y-300000D02*\nY300000D01*\n' +
			'X5000000Y0D02*\nX5800000D01*\nM02*\n';
		const r = ok(importGerberPasteLayer(header + body));
		expect(r.apertures).toHaveLength(2);
		expect(r.drawn.drawsUsed).toBe(3);
		// The cross: 1.0·0.2 + 0.6·0.2 − 0.2·0.2 (the shared square counted once) plus, for each
		// stroke, its two half-disc ends (one disc, π·0.1²).
		const cross = 1000 * 200 + 600 * 200 - 200 * 200 + 2 * Math.PI * 100 ** 2;
		const areas = r.apertures.map((a) => apertureGeometry(a).areaUm2).sort((p, q) => q - p);
		expect(cross - areas[0]).toBeGreaterThanOrEqual(0);
		expect(cross - areas[0]).toBeLessThanOrEqual(0.5 * 6000);
	});

	it(`a long thin stroke (elongation above ${MAX_PAD_ELONGATION}) is left out with its line`, () => {
		// 2 mm × 0.1 mm: D²/A = 2.1² / (0.2 + π·0.05²) ≈ 21.2.
		const r = ok(
			importGerberPasteLayer(
				`${header}%ADD10C,0.1*%\n%ADD11R,1X1*%\nD10*\nX0Y0D02*\nG01X1000000Y0D01*\nX2000000D01*\nD11*\nX5000000Y5000000D03*\nM02*\n`
			)
		);
		expect(r.apertures).toHaveLength(1);
		expect(r.counts.drawsSkipped).toBe(2);
		expect(r.drawn.lineLikeIslands).toBe(1);
		expect(r.warnings.join('\n')).toContain('at lines 7, 8');
	});

	it('a closed outline (an island with a hole) is line-like whatever its size', () => {
		const r = importGerberPasteLayer(
			`${header}%ADD10C,0.1*%\nD10*\nX0Y0D02*\nG01X3000000D01*\nY3000000D01*\nX0D01*\nY0D01*\nM02*\n`
		);
		expect('errors' in r).toBe(true);
		if (!('errors' in r)) return;
		expect(r.errors[0].message).toContain(
			'no flashes (D03) or regions (G36/G37), and the 4 draw(s)'
		);
		expect(r.errors.map((e) => e.message).join('\n')).toContain('at lines 6, 7, 8, 9');
	});

	it('drawn arcs (G75 multi quadrant and G74 single quadrant) are stroked along the arc', () => {
		// Half ring: pen 0.2 mm along a 180° arc of radius 0.5 mm, G75 then the same in two G74
		// quarter arcs. Area: π(0.6² − 0.4²)/2 + π·0.1² (two half-disc ends) = 0.1·π + 0.01·π.
		const exact = (Math.PI * (600 ** 2 - 400 ** 2)) / 2 + Math.PI * 100 ** 2;
		const multi = ok(
			importGerberPasteLayer(
				`${header}%ADD10C,0.2*%\nD10*\nX500000Y0D02*\nG75*\nG03X-500000Y0I-500000J0D01*\nM02*\n`
			)
		);
		const single = ok(
			importGerberPasteLayer(
				`${header}%ADD10C,0.2*%\nD10*\nX500000Y0D02*\nG74*\nG03X0Y500000I500000J0D01*\nX-500000Y0I0J500000D01*\nM02*\n`
			)
		);
		for (const r of [multi, single]) {
			expect(r.apertures).toHaveLength(1);
			const area = apertureGeometry(r.apertures[0]).areaUm2;
			expect(Math.abs(exact - area) / exact).toBeLessThan(0.002);
		}
	});

	it('step-and-repeat copies each stroke', () => {
		const r = ok(
			importGerberPasteLayer(
				`${header}%ADD10C,0.25*%\n%SRX3Y2I2J3*%\nD10*\nX0Y0D02*\nG01X1000000D01*\n%SR*%\nM02*\n`
			)
		);
		expect(r.apertures).toHaveLength(6);
		expect(r.apertures.every((a) => a.drawn)).toBe(true);
	});

	it('clear-polarity draws are skipped and named', () => {
		const r = ok(
			importGerberPasteLayer(
				`${header}%ADD10C,0.25*%\nD10*\nX0Y0D02*\nG01X1000000D01*\n%LPC*%\nX0Y0D02*\nX500000D01*\nM02*\n`
			)
		);
		expect(r.apertures).toHaveLength(1);
		expect(r.warnings.join('\n')).toContain('1 clear-polarity draw(s) skipped (lines 9)');
	});

	it('counts the stroke segments against the budget before building polygons (413)', () => {
		const strokes = Array.from(
			{ length: 30 },
			(_, k) => `X${k * 1000000}Y0D02*\nX${k * 1000000 + 500000}Y0D01*`
		).join('\n');
		const r = importGerberPasteLayer(`${header}%ADD10C,0.2*%\nD10*\nG01*\n${strokes}\nM02*\n`, {
			limits: withLimits({ maxDrawSegmentsPerLayer: 20 })
		});
		expect('errors' in r && r.overBudget).toBe(true);
		if (!('errors' in r)) return;
		expect(r.errors[0].message).toContain('more than 20 draws');
		// Arcs count their chords: one full circle of radius 5 mm is far more than 20 chords.
		const arc = importGerberPasteLayer(
			`${header}%ADD10C,0.2*%\nD10*\nX5000000Y0D02*\nG75*\nG03X5000000Y0I-5000000J0D01*\nM02*\n`,
			{
				limits: withLimits({ maxDrawSegmentsPerLayer: 20 })
			}
		);
		expect('errors' in arc && arc.errors[0].message).toContain('more than 20 stroke segments');
	});

	it('lists lines briefly', () => {
		expect(listLines([9, 3, 3, 4])).toBe('3, 4, 9');
		expect(listLines([1, 2, 3, 4, 5, 6, 7, 8, 9, 10])).toBe('1, 2, 3, 4, 5, 6, 7, 8 and 2 more');
	});
});
