import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { parseApertureCsv } from './aperture-csv';
import { apertureGeometry } from './geometry';

const HEADER = 'refdes,pad,shape,length,width,corner_radius,diameter,x,y,rotation,vertices';

/** The example block of the layout document must import cleanly (keeps doc and code in step). */
function layoutExample(): string {
	const md = readFileSync(
		fileURLToPath(new URL('../../../reference/stencil/aperture-csv-layout.md', import.meta.url)),
		'utf8'
	);
	return /```csv\n([\s\S]*?)```/.exec(md)![1];
}

describe('parseApertureCsv: the documented example (unit mm)', () => {
	const r = parseApertureCsv(layoutExample(), 'mm');
	it('imports all six rows', () => {
		expect('apertures' in r && r.apertures.length).toBe(6);
	});
	it('converts mm to µm and maps every shape', () => {
		if (!('apertures' in r)) throw new Error(JSON.stringify(r));
		const [u1, , c3, j2, u7, q1] = r.apertures;
		expect(u1).toEqual({
			refdes: 'U1',
			pad: '1',
			shape: 'rectangle',
			lengthUm: 1000,
			widthUm: 200,
			xUm: 10000,
			yUm: 5000,
			rotationDeg: 0
		});
		expect(c3).toMatchObject({ shape: 'rounded-rectangle', cornerRadiusUm: 50, rotationDeg: 90 });
		expect(j2).toMatchObject({
			shape: 'rounded-rectangle',
			lengthUm: 1800,
			widthUm: 900,
			cornerRadiusUm: 450
		});
		expect(u7).toMatchObject({ shape: 'circle', diameterUm: 250 });
		expect(q1.verticesUm).toEqual([
			[-500, -300],
			[500, -300],
			[500, 300],
			[0, 600],
			[-500, 300]
		]);
		// Pentagon: 1000×600 rectangle + triangle of base 1000, height 300 → 600000 + 150000
		expect(apertureGeometry(q1).areaUm2).toBeCloseTo(750000, 6);
	});
});

describe('parseApertureCsv: units and header tolerance', () => {
	it('mil: 1 mil = 25.4 µm', () => {
		const r = parseApertureCsv('refdes,pad,shape,diameter,x,y\nU1,A1,circle,10,100,0\n', 'mil');
		expect(r).toEqual({
			apertures: [
				{
					refdes: 'U1',
					pad: 'A1',
					shape: 'circle',
					diameterUm: 254,
					xUm: 2540,
					yUm: 0,
					rotationDeg: 0
				}
			]
		});
	});
	it('case, spaces, unit notes, column order, CRLF, BOM, blank and comment lines', () => {
		const text =
			'\uFEFF# exported by hand\r\nY,X, Shape ,Width (um),Length (um),RefDes,Pad\r\n\r\n0,0,RECT,200,1000,R1,2\r\n';
		expect(parseApertureCsv(text, 'um')).toEqual({
			apertures: [
				{
					refdes: 'R1',
					pad: '2',
					shape: 'rectangle',
					lengthUm: 1000,
					widthUm: 200,
					xUm: 0,
					yUm: 0,
					rotationDeg: 0
				}
			]
		});
	});
	it('"rectangle" with a corner radius stays rectangle but computes as rounded', () => {
		const r = parseApertureCsv(`${HEADER}\nU1,1,rectangle,1,0.3,0.1,,0,0,0,\n`, 'mm');
		if (!('apertures' in r)) throw new Error('expected apertures');
		expect(r.apertures[0].cornerRadiusUm).toBe(100);
		expect(apertureGeometry(r.apertures[0]).areaUm2).toBeCloseTo(291415.926536, 5);
	});
});

describe('parseApertureCsv: errors name line and column', () => {
	const cases: { name: string; text: string; errors: [number, string | null, RegExp][] }[] = [
		{ name: 'empty file', text: '', errors: [[1, null, /empty/]] },
		{ name: 'header only', text: HEADER + '\n', errors: [[1, null, /no aperture rows/]] },
		{
			name: 'missing columns',
			text: 'refdes,pad,length\nU1,1,2\n',
			errors: [
				[1, 'shape', /required column "shape" is missing/],
				[1, 'x', /"x"/],
				[1, 'y', /"y"/]
			]
		},
		{
			name: 'not a number',
			text: `${HEADER}\nU1,1,rectangle,abc,0.2,,,0,0,0,\n`,
			errors: [[2, 'length', /must be a number \(got "abc"\)/]]
		},
		{
			name: 'comma decimal is not a number',
			text: 'refdes,pad,shape,diameter,x,y\nU1,1,circle,"0,3",0,0\n',
			errors: [[2, 'diameter', /must be a number/]]
		},
		{
			name: 'unknown shape',
			text: `${HEADER}\nU1,1,hexagon,1,1,,,0,0,0,\n`,
			errors: [[2, 'shape', /unknown shape "hexagon"/]]
		},
		{
			name: 'missing size for shape',
			text: `${HEADER}\nU1,1,circle,,,,,0,0,0,\n`,
			errors: [[2, 'diameter', /required for this shape/]]
		},
		{
			name: 'zero width',
			text: `${HEADER}\nU1,1,rectangle,1,0,,,0,0,0,\n`,
			errors: [[2, 'width', /greater than 0/]]
		},
		{
			name: 'radius too big',
			text: `${HEADER}\nU1,1,rounded-rectangle,1,0.2,0.2,,0,0,0,\n`,
			errors: [[2, 'corner_radius', /exceeds half/]]
		},
		{
			name: 'bad vertex',
			text: `${HEADER}\nQ1,1,polygon,,,,,0,0,0,0 0;1 x;0 1\n`,
			errors: [[2, 'vertices', /vertex 2 must be two numbers/]]
		},
		{
			name: 'self-intersecting polygon',
			text: `${HEADER}\nQ1,1,polygon,,,,,0,0,0,0 0;1 1;1 0;0 1\n`,
			errors: [[2, 'vertices', /intersects itself/]]
		},
		{
			name: 'absurd size in mm (unit mistake)',
			text: `${HEADER}\nU1,1,rectangle,1000,0.2,,,0,0,0,\n`,
			errors: [[2, 'length', /100 mm/]]
		},
		{
			name: 'extra cells',
			text: 'refdes,pad,shape,diameter,x,y\nU1,1,circle,0.3,0,0,7\n',
			errors: [[2, null, /6 columns/]]
		},
		{
			name: 'line numbers count blank and comment lines',
			text: `${HEADER}\n\n# note\nU1,1,circle,,,,0.3,0,0,0,\nU2,1,circle,,,,-1,0,0,0,\n`,
			errors: [[5, 'diameter', /greater than 0/]]
		}
	];
	for (const c of cases)
		it(c.name, () => {
			const r = parseApertureCsv(c.text, 'mm');
			expect('errors' in r).toBe(true);
			if (!('errors' in r)) return;
			expect(r.errors.map((e) => [e.row, e.column])).toEqual(
				c.errors.map(([row, col]) => [row, col])
			);
			r.errors.forEach((e, k) => {
				expect(e.message).toMatch(c.errors[k][2]);
				expect(e.message.startsWith(`line ${e.row}, ${e.column ?? 'row'}: `)).toBe(true);
			});
		});
	it('a quoted field with a line break does not shift later line numbers', () => {
		const text = `refdes,pad,shape,diameter,x,y\n"U\n1",1,circle,0.3,0,0\nU2,1,circle,x,0,0\n`;
		const r = parseApertureCsv(text, 'mm');
		expect('errors' in r && r.errors.map((e) => e.row)).toEqual([4]);
	});
	it('caps the error list at 100', () => {
		const rows = Array.from({ length: 150 }, () => 'U1,1,circle,,,,bad,0,0,0,').join('\n');
		const r = parseApertureCsv(`${HEADER}\n${rows}\n`, 'mm');
		expect('errors' in r && r.errors.length).toBe(100);
	});
});
