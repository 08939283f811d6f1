import { describe, expect, it } from 'vitest';
import { importGerberPasteLayer, type GerberImportSuccess } from './gerber-import';
import { apertureGeometry } from './geometry';

// Macro primitives (Gerber Layer Format Specification, "Aperture macro (AM)": circle 1 with its
// rotation, vector line 20 and its deprecated form 2, center line 21, deprecated lower-left line
// 22, outline 4 with rotation, polygon 5). Expected shapes worked out by hand in each case.
const h = '%FSLAX26Y26*%\n%MOMM*%\n';
function one(body: string): GerberImportSuccess {
	const r = importGerberPasteLayer(h + body + '%ADD10M*%\nD10*\nX0Y0D03*\nM02*\n');
	if ('errors' in r) throw new Error(JSON.stringify(r.errors));
	expect(r.apertures).toHaveLength(1);
	return r;
}

describe('macro primitives with rotation and deprecated forms', () => {
	it('circle (1) at (1, 0) rotated 90° about the origin lands at (0, 1)', () => {
		const a = one('%AMM*\n1,1,0.5,1,0,90*%\n').apertures[0];
		expect(a).toMatchObject({ shape: 'circle', diameterUm: 500 });
		expect(a.xUm).toBeCloseTo(0, 6);
		expect(a.yUm).toBeCloseTo(1000, 6);
	});
	it('deprecated vector line (2) from (0,0) to (1,0), width 0.2: a 1 × 0.2 rectangle centred at (0.5, 0)', () => {
		const r = one('%AMM*\n2,1,0.2,0,0,1,0,0*%\n');
		expect(r.apertures[0]).toMatchObject({
			shape: 'rectangle',
			lengthUm: 1000,
			widthUm: 200,
			xUm: 500,
			yUm: 0
		});
		expect(r.warnings.join()).toContain('deprecated');
	});
	it('deprecated lower-left line (22) 1 × 0.5 at (0, 0): centred at (0.5, 0.25)', () => {
		const a = one('%AMM*\n22,1,1,0.5,0,0,0*%\n').apertures[0];
		expect(a).toMatchObject({
			shape: 'rectangle',
			lengthUm: 1000,
			widthUm: 500,
			xUm: 500,
			yUm: 250
		});
	});
	it('center line (21) 1 × 0.5 rotated 45°', () => {
		const a = one('%AMM*\n21,1,1,0.5,0,0,45*%\n').apertures[0];
		expect(a).toMatchObject({ shape: 'rectangle', lengthUm: 1000, widthUm: 500, rotationDeg: 45 });
	});
	it('outline (4) triangle (0,0) (1,0) (0,1) rotated 90°: (0,0) (0,1) (−1,0), area 0.5 mm²', () => {
		const a = one('%AMM*\n4,1,3,0,0,1,0,0,1,0,0,90*%\n').apertures[0];
		expect(apertureGeometry(a).areaUm2).toBeCloseTo(500_000, 3);
		const pts = a.verticesUm!.map(([x, y]) => [Math.round(x + a.xUm), Math.round(y + a.yUm)]);
		expect(pts).toEqual(
			expect.arrayContaining([
				[0, 0],
				[0, 1000],
				[-1000, 0]
			])
		);
	});
	it('polygon (5) of 6 vertices, diameter 1: hexagon (3√3/2)·0.5² mm²', () => {
		const a = one('%AMM*\n5,1,6,0,0,1,0*%\n').apertures[0];
		// The plotter keeps vertices to 1e-4 µm (433.0127 for 250√3), so the area to 0.01 µm².
		expect(
			Math.abs(apertureGeometry(a).areaUm2 - ((3 * Math.sqrt(3)) / 2) * 500 ** 2)
		).toBeLessThan(0.01);
	});
});
