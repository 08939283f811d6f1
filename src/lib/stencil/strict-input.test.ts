/**
 * Strict numbers and counted outlines in the aperture checks and the CSV readers (issue 11), and
 * the relative tolerance of checks made after a unit conversion (issue 15).
 */
import { describe, expect, it } from 'vitest';
import { checkAperture } from './aperture-validation';
import { evaluateStencil } from './evaluate-stencil';
import { IPC_7525_THRESHOLDS } from './thresholds';
import { parseApertureCsv } from './aperture-csv';
import { parseCentroidCsv } from './centroid-csv';
import { formatCount, withLimits } from './limits';
import { circle, polygon, rect } from './test-fixtures';
import { MICROMETRES_PER } from '../units';

const HEADER = 'refdes,pad,shape,length,width,corner_radius,diameter,x,y,rotation,vertices';
const ring = (n: number, r = 1000) =>
	Array.from({ length: n }, (_, k): [number, number] => [
		r * Math.cos((2 * Math.PI * k) / n),
		r * Math.sin((2 * Math.PI * k) / n)
	]);

describe('checkAperture: ranges and counts', () => {
	it('a rotation of 1e308 or 361° is refused; -360..360° is accepted', () => {
		expect(checkAperture(rect(500, 200, { rotationDeg: 1e308 }))).toEqual([
			{ where: 'U1.1', field: 'rotationDeg', message: '1e+308° is outside -360..360°' }
		]);
		expect(checkAperture(rect(500, 200, { rotationDeg: 361 }))[0].field).toBe('rotationDeg');
		expect(checkAperture(rect(500, 200, { rotationDeg: -360 }))).toEqual([]);
	});

	it('sizes below 1 µm are refused as a likely unit mistake', () => {
		expect(checkAperture(circle(0.5))).toEqual([
			{
				where: 'U1.A1',
				field: 'diameterUm',
				message: '0.5 µm is below the 1 µm minimum; check the unit'
			}
		]);
		expect(checkAperture(circle(1))).toEqual([]);
	});

	it('an outline over the vertex limit is refused by its count, before any vertex is read', () => {
		const big = ring(1001);
		big[500] = [NaN, NaN]; // never looked at: the count decides first
		expect(checkAperture(polygon(big))).toEqual([
			{
				where: 'Q1.1',
				field: 'verticesUm',
				message: 'the outline has 1,001 vertices; the limit is 1,000 per outline'
			}
		]);
		expect(checkAperture(polygon(ring(1000)))).toEqual([]);
	});

	it('an inch obround whose radius comes out a hair over half its side is accepted (relative 1e-6)', () => {
		// 0.009574 in = 243.18 µm wide, half 121.59 µm: 0.0001 µm over is 8e-7 of it (accepted),
		// 0.001 µm over is 8e-6 (refused).
		const width = 0.009574 * MICROMETRES_PER.inch;
		const ok = rect(1000, width, {
			shape: 'rounded-rectangle',
			cornerRadiusUm: width / 2 + 0.0001
		});
		expect(checkAperture(ok)).toEqual([]);
		const over = rect(1000, width, {
			shape: 'rounded-rectangle',
			cornerRadiusUm: width / 2 + 0.001
		});
		expect(checkAperture(over)[0].field).toBe('cornerRadiusUm');
		// The issue's case: radius 121.6 µm against a half side of 121.59995 µm.
		const issue = rect(1000, 2 * 121.59995, { shape: 'rounded-rectangle', cornerRadiusUm: 121.6 });
		expect(checkAperture(issue)).toEqual([]);
	});
});

describe('aperture CSV: strict cells, counted vertices', () => {
	it('1e308 mm is out of range, naming line and column; a rotation of 1e308 is refused', () => {
		const r = parseApertureCsv(
			`${HEADER}\nU1,1,circle,,,,1e308,0,0,0,\nU2,1,circle,,,,0.3,0,0,1e308,\n`,
			'mm'
		);
		expect(r).toEqual({
			errors: [
				{ row: 2, column: 'diameter', message: 'line 2, diameter: is out of range (got "1e308")' },
				{ row: 3, column: 'rotation', message: 'line 3, rotation: 1e+308° is outside -360..360°' }
			]
		});
	});

	it('0x10 and other loose numbers are not numbers', () => {
		const r = parseApertureCsv(`${HEADER}\nU1,1,circle,,,,0x10,0,0,0,\n`, 'mm');
		expect(r).toEqual({
			errors: [
				{ row: 2, column: 'diameter', message: 'line 2, diameter: must be a number (got "0x10")' }
			]
		});
	});

	it('NUL bytes and invalid UTF-8 are refused with line and column', () => {
		expect(parseApertureCsv(`${HEADER}\nU\u00001,1,circle,,,,0.3,0,0,0,\n`, 'mm')).toEqual({
			errors: [
				{
					row: 2,
					column: null,
					message:
						'this is not a CSV file: line 2, row: column 2 holds a control character (U+0000); the file must be UTF-8 text'
				}
			]
		});
		const r = parseCentroidCsv('refdes,x,y\nU\uFFFD1,1,2\n', 'mm');
		expect(r).toMatchObject({
			errors: [
				{ row: 2, message: expect.stringMatching(/column 2 holds bytes that are not valid UTF-8/) }
			]
		});
	});

	it('a binary file (zip bytes) uploaded as an aperture CSV is one error: not a CSV file (issue 13)', () => {
		const zip = 'PK\u0003\u0004\u0014\u0000\u0008\u0000\uFFFD\uFFFDrefdes,pad';
		const r = parseApertureCsv(zip, 'mm');
		expect(r).toMatchObject({
			errors: [{ row: 1, message: expect.stringMatching(/^this is not a CSV file: /) }]
		});
		expect('errors' in r && r.errors).toHaveLength(1);
	});

	it('a polygon cell over the vertex limit is refused by counting its separators', () => {
		const cell = Array.from({ length: 1500 }, (_, k) => `${k % 7} ${k % 5}`).join(';');
		const r = parseApertureCsv(`${HEADER}\nQ1,1,polygon,,,,,0,0,0,${cell}\n`, 'mm');
		expect(r).toEqual({
			errors: [
				{
					row: 2,
					column: 'vertices',
					message:
						'line 2, vertices: the outline has 1,500 vertices; the limit is 1,000 per outline'
				}
			]
		});
	});

	it('polygon vertices of the whole file are counted against the per-import budget (413)', () => {
		const cell = ring(100, 1)
			.map(([x, y]) => `${x.toFixed(6)} ${y.toFixed(6)}`)
			.join(';');
		const rows = Array.from({ length: 4 }, (_, i) => `Q${i},1,polygon,,,,,${i * 5},0,0,${cell}`);
		const r = parseApertureCsv(
			`${HEADER}\n${rows.join('\n')}\n`,
			'mm',
			withLimits({ maxVerticesPerImport: 250 })
		);
		expect(r).toMatchObject({ overBudget: true });
		if (!('errors' in r)) return;
		expect(r.errors.at(-1)).toEqual({
			row: 4,
			column: 'vertices',
			message: `line 4, vertices: the polygons reach more than 250 vertices by this row; the limit is ${formatCount(250)} per import`
		});
	});

	it('a centroid beyond 2 m is refused', () => {
		expect(parseCentroidCsv('refdes,x,y\nU1,2500,0\n', 'mm')).toEqual({
			errors: [{ row: 2, column: 'x', message: 'line 2, x: 2500 mm is beyond ±2000 mm' }]
		});
	});
});

describe('evaluateStencil: the crossing test on reads of stored outlines', () => {
	// Edges 0 and 2 cross at (75, 75); the signed area is not zero, so only the crossing test
	// refuses it.
	const crossing = polygon([
		[0, 0],
		[300, 300],
		[300, 0],
		[0, 100]
	]);
	const settings = { thicknessUm: 100, thresholds: IPC_7525_THRESHOLDS };
	it('is made by default, and left out when the caller says the outlines were checked on import', () => {
		expect(() => evaluateStencil([crossing], settings)).toThrow(/intersects itself/);
		expect(evaluateStencil([crossing], { ...settings, outlineCrossing: false })).toHaveLength(1);
		// The other checks stay: a rotation out of range is refused either way.
		const turned = polygon(ring(8, 100), { rotationDeg: 400 });
		expect(() => evaluateStencil([turned], { ...settings, outlineCrossing: false })).toThrow(
			/rotationDeg/
		);
	});
});
