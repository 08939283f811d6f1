import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { MAX_CSV_BYTES, MAX_GERBER_BYTES, detectUploadFormat, parseApertureUpload } from './upload';

const fixture = (name: string) => readFileSync(`tests/fixtures/stencil/${name}`, 'utf8');
const upload = (fileName: string, text: string, extra: object = {}) =>
	parseApertureUpload({ fileName, text, byteLength: Buffer.byteLength(text), ...extra });

describe('detectUploadFormat', () => {
	it.each([
		['layer.txt', '%FSLAX26Y26*%\n%MOMM*%\n', 'gerber'],
		['layer.csv', 'G04 comment*\n%FSLAX26Y26*%', 'gerber'],
		['top.gtp', 'anything', 'gerber'],
		['top.csv', 'refdes,pad,shape,x,y\n', 'csv'],
		['noext', 'refdes,pad,shape,x,y\n', 'csv']
	])('%s → %s', (name, text, expected) => {
		expect(detectUploadFormat(name, text)).toBe(expected);
	});
});

describe('parseApertureUpload', () => {
	it('reads our CSV in mm (layout example: 0.30 mm = 300 µm)', () => {
		const r = upload('apertures.csv', fixture('apertures.csv'), { unit: 'mm' });
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(r.format).toBe('csv');
		expect(r.apertures).toHaveLength(4);
		expect(r.apertures[0]).toMatchObject({ refdes: 'R9', lengthUm: 300, widthUm: 280, xUm: 50000 });
	});

	it('refuses a CSV without a unit (400) and a bad cell naming line and column (422)', () => {
		const noUnit = upload('apertures.csv', fixture('apertures.csv'));
		expect(noUnit).toMatchObject({ ok: false, status: 400 });
		const bad = upload('bad-apertures.csv', fixture('bad-apertures.csv'), { unit: 'mm' });
		expect(bad).toMatchObject({ ok: false, status: 422 });
		if (bad.ok) return;
		expect(bad.errors).toEqual([
			{
				file: 'bad-apertures.csv',
				line: 3,
				column: 'width',
				message: 'line 3, width: must be a number (got "wide")'
			}
		]);
	});

	it('imports the hand-written Gerber fixture and names apertures from centroids', () => {
		const plain = upload('paste-top.gbr', fixture('paste-top.gbr'));
		expect(plain.ok).toBe(true);
		if (!plain.ok) return;
		expect(plain.unit).toBe('mm');
		expect(plain.apertures).toHaveLength(7);
		// Standard template C,0.25 → circle of 250 µm at (10, 10) mm.
		expect(plain.apertures.find((a) => a.shape === 'circle')).toMatchObject({
			diameterUm: 250,
			xUm: 10000,
			yUm: 10000
		});
		const named = upload('paste-top.gbr', fixture('paste-top.gbr'), {
			centroids: { fileName: 'centroids.csv', text: fixture('centroids.csv'), byteLength: 60 },
			centroidUnit: 'mm',
			centroidRadiusUm: 2000
		});
		expect(named.ok).toBe(true);
		if (!named.ok) return;
		expect(new Set(named.apertures.map((a) => a.refdes))).toEqual(
			new Set(['U7', 'U1', 'C3', 'J2'])
		);
		expect(named.warnings).toEqual([]);
	});

	it('reports a broken Gerber with its line and refuses oversized files (413)', () => {
		const broken = upload(
			'x.gbr',
			'%FSLAX26Y26*%\n%MOMM*%\n%ADD10C,0.25*%\nD10*\nX1000Y1000D03*\nD99*\nX2000Y1000D03*\nM02*\n'
		);
		expect(broken.ok).toBe(false);
		if (broken.ok) return;
		expect(broken.status).toBe(422);
		expect(broken.errors[0].line).toBeGreaterThan(0);
		expect(broken.errors[0].message).toMatch(/^line \d+/);
		const big = parseApertureUpload({
			fileName: 'x.gbr',
			text: '%FSLAX26Y26*%',
			byteLength: MAX_GERBER_BYTES + 1
		});
		expect(big).toMatchObject({ ok: false, status: 413 });
		if (!big.ok) expect(big.error).toContain('at most 5 MB');
		const bigCsv = parseApertureUpload({
			fileName: 'x.csv',
			text: 'a',
			byteLength: MAX_CSV_BYTES + 1,
			unit: 'mm'
		});
		expect(bigCsv).toMatchObject({ ok: false, status: 413 });
	});

	it('refuses a centroid file with a bad row, naming its line', () => {
		const r = upload('paste-top.gbr', fixture('paste-top.gbr'), {
			centroids: { fileName: 'c.csv', text: 'refdes,x,y\nU1,1,1\nU1,2,2\n', byteLength: 30 },
			centroidUnit: 'mm'
		});
		expect(r).toMatchObject({ ok: false, status: 422 });
		if (!r.ok) expect(r.errors[0]).toMatchObject({ file: 'c.csv', line: 3, column: 'refdes' });
	});
});
