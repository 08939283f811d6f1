import { describe, it, expect } from 'vitest';
import { readFileSync } from 'node:fs';
import type { ApertureInput } from './aperture';
import { apertureGeometry } from './geometry';
import {
	importGerberPasteLayer,
	type GerberImportFailure,
	type GerberImportResult,
	type GerberImportSuccess
} from './gerber-import';

// Hand-written layers and their hand-computed results: reference/stencil/gerber/README.md.
const refDir = new URL('../../../reference/stencil/gerber/', import.meta.url);
const readRef = (name: string) => readFileSync(new URL(name, refDir), 'utf8');

interface ExpectedAperture {
	refdes: string;
	shape: ApertureInput['shape'];
	xUm: number;
	yUm: number;
	diameterUm?: number;
	lengthUm?: number;
	widthUm?: number;
	cornerRadiusUm?: number;
	rotationDeg?: number;
	vertexCount?: number;
	areaUm2: number;
	areaTolUm2?: number;
	areaMinUm2?: number;
}
interface ExpectedFile {
	units: 'mm' | 'in';
	counts: GerberImportSuccess['counts'];
	positionTolUm?: number;
	warningsContaining?: string[];
	apertures: ExpectedAperture[];
}
const expected = JSON.parse(readRef('expected.json')) as {
	files: Record<string, ExpectedFile>;
	failures: Record<string, { errorContaining: string[] }>;
};

function ok(result: GerberImportResult): GerberImportSuccess {
	if ('errors' in result) throw new Error(`import failed: ${JSON.stringify(result.errors)}`);
	return result;
}

function failed(result: GerberImportResult): GerberImportFailure {
	if (!('errors' in result)) throw new Error(`import unexpectedly succeeded`);
	return result;
}

const header = '%FSLAX26Y26*%\n%MOMM*%\n';

describe('importGerberPasteLayer on the reference layers', () => {
	for (const [file, exp] of Object.entries(expected.files)) {
		describe(file, () => {
			const result = ok(importGerberPasteLayer(readRef(file)));

			it('reports the units and counts', () => {
				expect(result.units).toBe(exp.units);
				expect(result.counts).toEqual(exp.counts);
				expect(result.apertures.length).toBe(exp.apertures.length);
			});

			it('warns exactly as expected', () => {
				if (!exp.warningsContaining) expect(result.warnings).toEqual([]);
				else
					for (const w of exp.warningsContaining) expect(result.warnings.join('\n')).toContain(w);
			});

			for (const e of exp.apertures) {
				it(`${e.refdes}: ${e.shape} at (${e.xUm}, ${e.yUm}) µm, area ${e.areaUm2} µm²`, () => {
					const a = result.apertures.find((x) => x.refdes === e.refdes);
					expect(a).toBeDefined();
					const got = a as ApertureInput;
					const posTol = exp.positionTolUm ?? 1e-3;
					expect(got.pad).toBe('1');
					expect(got.shape).toBe(e.shape);
					expect(Math.abs(got.xUm - e.xUm)).toBeLessThanOrEqual(posTol);
					expect(Math.abs(got.yUm - e.yUm)).toBeLessThanOrEqual(posTol);
					for (const key of ['diameterUm', 'lengthUm', 'widthUm', 'cornerRadiusUm'] as const) {
						if (e[key] !== undefined) expect(got[key]).toBeCloseTo(e[key] as number, 3);
					}
					if (e.rotationDeg !== undefined) expect(got.rotationDeg).toBeCloseTo(e.rotationDeg, 6);
					if (e.vertexCount !== undefined) expect(got.verticesUm?.length).toBe(e.vertexCount);
					// apertureGeometry also validates the aperture, so this proves it is usable.
					const area = apertureGeometry(got).areaUm2;
					if (e.areaMinUm2 !== undefined) {
						expect(area).toBeGreaterThanOrEqual(e.areaMinUm2);
						expect(area).toBeLessThanOrEqual(e.areaUm2 + 1e-6);
					} else {
						expect(Math.abs(area - e.areaUm2)).toBeLessThanOrEqual(e.areaTolUm2 ?? 0.01);
					}
				});
			}
		});
	}

	for (const [file, exp] of Object.entries(expected.failures)) {
		it(`${file} fails with a clear error`, () => {
			const { errors } = failed(importGerberPasteLayer(readRef(file)));
			for (const text of exp.errorContaining)
				expect(errors.map((e) => e.message).join('\n')).toContain(text);
		});
	}

	it('gives the same apertures for the same board in inches and in millimetres (1 in = 25.4 mm)', () => {
		// 0.02 in = 0.508 mm and 1 in = 25.4 mm exactly, so both files describe identical pads.
		const inch = ok(importGerberPasteLayer(readRef('standard-apertures-inch.gbr')));
		const mm = ok(
			importGerberPasteLayer(
				`${header}%ADD10C,0.508*%\n%ADD11R,1.016X0.508*%\n%ADD12O,1.27X0.635*%\n` +
					'D10*\nX25400000Y12700000D03*\nD11*\nX50800000Y12700000D03*\nD12*\nX76200000Y-12700000D03*\nM02*\n'
			)
		);
		expect(mm.units).toBe('mm');
		expect(inch.apertures).toEqual(mm.apertures);
	});

	it('puts the first vertex of a standard P aperture on +x before rotation (Gerber spec, P template)', () => {
		const hex = ok(importGerberPasteLayer(readRef('standard-apertures-mm.gbr'))).apertures.find(
			(a) => a.shape === 'polygon'
		) as ApertureInput;
		expect(hex.verticesUm?.[0][0]).toBeCloseTo(500, 6);
		expect(hex.verticesUm?.[0][1]).toBeCloseTo(0, 6);
		// Each vertex lies on the circumscribed circle, R = 0.5 mm.
		for (const [x, y] of hex.verticesUm ?? []) expect(Math.hypot(x, y)).toBeCloseTo(500, 3);
	});

	it('keeps every region vertex of the arc layer within the arc tolerance of the true outline', () => {
		const result = ok(importGerberPasteLayer(readRef('region-arcs.gbr')));
		const circle = result.apertures.find((a) => a.refdes === '@0003') as ApertureInput;
		// The full circle: centre (5000, 500), r = 500 µm; vertices lie on the arc itself.
		for (const [x, y] of circle.verticesUm ?? []) {
			expect(Math.abs(Math.hypot(x + circle.xUm - 5000, y + circle.yUm - 500) - 500)).toBeLessThan(
				0.01
			);
		}
	});

	it('cuts arcs finer when a smaller tolerance is asked for, and the area gets closer to πr²', () => {
		const text = readRef('region-arcs.gbr');
		const coarse = ok(importGerberPasteLayer(text, { arcToleranceUm: 5 })).apertures[2];
		const fine = ok(importGerberPasteLayer(text, { arcToleranceUm: 0.05 })).apertures[2];
		const exact = Math.PI * 500 ** 2;
		expect(fine.verticesUm!.length).toBeGreaterThan(coarse.verticesUm!.length);
		expect(exact - apertureGeometry(fine).areaUm2).toBeLessThan(
			exact - apertureGeometry(coarse).areaUm2
		);
		expect(exact - apertureGeometry(fine).areaUm2).toBeLessThanOrEqual(0.05 * Math.PI * 1000);
	});
});

describe('importGerberPasteLayer: what it skips with a warning', () => {
	it('counts and skips draws (D01 outside regions) but keeps the flashes', () => {
		const r = ok(
			importGerberPasteLayer(
				`${header}%ADD10C,0.1*%\n%ADD11R,1X1*%\nD10*\nX0Y0D02*\nG01X1000000Y0D01*\nX2000000D01*\nD11*\nX5000000Y5000000D03*\nM02*\n`
			)
		);
		expect(r.counts.drawsSkipped).toBe(2);
		expect(r.apertures.length).toBe(1);
		expect(r.warnings).toEqual([
			expect.stringMatching(/^line 7, D01: 2 draw\(s\) outside regions skipped/)
		]);
	});

	it('a clear-polarity object that would leave a hole is ignored, naming the aperture it would cut', () => {
		const r = ok(
			importGerberPasteLayer(
				`${header}%ADD10R,2X2*%\n%ADD11C,0.5*%\nD10*\nX0Y0D03*\nX10000000Y0D03*\n%LPC*%\nD11*\nX0Y0D03*\nM02*\n`
			)
		);
		expect(r.apertures.length).toBe(2);
		const text = r.warnings.join('\n');
		expect(text).toContain(
			'line 10, %LPC: a clear-polarity object would leave a hole in 1 earlier aperture(s) (first from line 6), which an opening cannot have'
		);
		expect(text).toContain('1 clear-polarity object(s) applied as cuts, none an opening');
	});

	it('a clear-polarity object cuts what was drawn before it: the rest is a polygon, a wholly cleared flash is gone', () => {
		// 2 × 2 mm square at (0, 0), cut by a 2 × 2 mm clear square at (1, 0): left is x −1…0,
		// 1 × 2 mm = 2 mm² centred on (−0.5, 0). The flash at (10, 0) is cleared wholly.
		// The flash at (20, 0) comes after the clear one and is not cut.
		const r = ok(
			importGerberPasteLayer(
				`${header}%ADD10R,2X2*%\n%ADD11R,1X1*%\nD10*\nX0Y0D03*\nD11*\nX10000000Y0D03*\n%LPC*%\nD10*\nX1000000Y0D03*\nX10000000Y0D03*\n%LPD*%\nX20000000Y0D03*\nM02*\n`
			)
		);
		expect(r.apertures).toHaveLength(2);
		const [cutOne, later] = r.apertures;
		expect(cutOne.shape).toBe('polygon');
		expect(apertureGeometry(cutOne).areaUm2).toBeCloseTo(2_000_000, 3);
		expect(cutOne.xUm).toBeCloseTo(-500, 6);
		expect(later).toMatchObject({ shape: 'rectangle', xUm: 20000, lengthUm: 2000 });
		expect(r.warnings.join('\n')).toContain(
			'line 11, %LPC: a clear-polarity object cuts 1 earlier aperture(s) (first from line 6)'
		);
		expect(r.warnings.join('\n')).toContain(
			'line 12, %LPC: a clear-polarity object cuts 1 earlier aperture(s) (first from line 8)'
		);
	});

	it('skips apertures with a hole and names the aperture and its definition line', () => {
		const r = ok(
			importGerberPasteLayer(
				`${header}%ADD10C,1.0X0.3*%\n%ADD11C,1*%\nD10*\nX0Y0D03*\nD11*\nX0Y0D03*\nM02*\n`
			)
		);
		expect(r.counts).toEqual({ flashes: 1, regionContours: 0, flashesSkipped: 1, drawsSkipped: 0 });
		expect(r.warnings[0]).toBe(
			'line 6, D10: aperture D10 (defined at line 3) has a hole; a paste aperture with a hole cannot be represented; 1 flash(es) skipped'
		);
	});

	it('ignores X2 attributes, comments and identity image parameters silently', () => {
		const r = ok(
			importGerberPasteLayer(
				`G04 comment*\n%TF.FileFunction,Paste,Top*%\n${header}%IPPOS*%\n%MIA0B0*%\n%OFA0B0*%\n%SFA1.0B1.0*%\n` +
					`%TA.AperFunction,SMDPad,CuDef*%\n%ADD10C,1*%\n%TD*%\nD10*\n%TO.C,R1*%\nX0Y0D03*\n%TD*%\nM02*\n`
			)
		);
		expect(r.warnings).toEqual([]);
		expect(r.apertures.length).toBe(1);
	});

	it('fails when every flash is skipped, listing the reasons', () => {
		const { errors } = failed(
			importGerberPasteLayer(
				`${header}%AMT*7,0,0,1.0,0.6,0.2,0*%\n%ADD10T*%\nD10*\nX0Y0D03*\nM02*\n`
			)
		);
		expect(errors[0].message).toContain('no usable apertures');
		expect(errors.map((e) => e.message).join('\n')).toContain('thermal');
	});
});

describe('importGerberPasteLayer: bad files give an error with the line', () => {
	const good = readRef('standard-apertures-mm.gbr');
	const cases: { name: string; text: string; line: number; message: RegExp }[] = [
		{
			name: 'truncated (cut before M02)',
			text: good.slice(0, good.indexOf('D12*')),
			line: 18,
			message: /ends without M02; it may be truncated/
		},
		{
			name: 'truncated mid-command',
			text: good.slice(0, good.indexOf('M02') - 6),
			line: 22,
			message: /truncated/
		},
		{
			name: 'unknown command',
			text: good.replace('%LPD*%', '%XYZ123*%'),
			line: 7,
			message: /unsupported or unknown command "%XYZ123"/
		},
		{
			name: 'undefined aperture D-code',
			text: good.replace('D13*', 'D15*'),
			line: 21,
			message: /aperture D15 is not defined/
		},
		{
			name: 'garbage bytes',
			text: 'PK\u0003\u0004\u0000\u0001binary',
			line: 1,
			message: /column 3: binary data \(U\+0003\)/
		},
		{
			name: 'binary decoded as UTF-8',
			text: `${header}\uFFFD\uFFFD*\nM02*\n`,
			line: 3,
			message: /binary data \(U\+FFFD\)/
		},
		{
			name: 'units missing',
			text: good.replace('%MOMM*%', ''),
			line: 9,
			message: /units are not set/
		},
		{
			name: 'format missing',
			text: good.replace('%FSLAX26Y26*%', ''),
			line: 15,
			message: /coordinate comes before the format statement/
		},
		{ name: 'empty file', text: '', line: 0, message: /the file is empty/ },
		{ name: 'only whitespace', text: ' \n\t\r\n', line: 0, message: /the file is empty/ },
		{
			name: 'not Gerber (drill-like text)',
			text: 'M48\nMETRIC\nT1C0.3\n%\nX1Y1\nM30\n',
			line: 1,
			message: /not a Gerber file/
		},
		{
			name: 'no flashes or regions',
			text: `${header}%ADD10C,1*%\nM02*\n`,
			line: 0,
			message: /no flashes \(D03\) or regions/
		},
		{
			name: 'undefined macro',
			text: `${header}%ADD10NOPE,1*%\nD10*\nX0Y0D03*\nM02*\n`,
			line: 3,
			message: /macro "NOPE" is not defined/
		},
		{
			name: 'unknown macro primitive',
			text: `${header}%AMBAD*9,1,2*%\n%ADD10BAD*%\nD10*\nX0Y0D03*\nM02*\n`,
			line: 3,
			message: /macro primitive code "9" is not supported/
		},
		{
			name: 'region never closed',
			text: `${header}G36*\nX0Y0D02*\nG01X1000000D01*\nY1000000D01*\nM02*\n`,
			line: 3,
			message: /never closed with G37/
		},
		{
			name: 'flash inside a region',
			text: `${header}%ADD10C,1*%\nD10*\nG36*\nX0Y0D03*\nG37*\nM02*\n`,
			line: 6,
			message: /flash inside a region/
		},
		{
			name: 'incremental coordinates',
			text: good.replace('%FSLAX26Y26*%', '%FSLIX26Y26*%'),
			line: 3,
			message: /incremental coordinates/
		},
		{
			name: 'image mirroring',
			text: good.replace('%LPD*%', '%MIA1B0*%'),
			line: 7,
			message: /image mirroring \(%MI\) is not supported/
		},
		{
			name: 'aperture rotation (%LR)',
			text: good.replace('%LPD*%', '%LR45*%'),
			line: 7,
			message: /aperture transformations/
		},
		{
			name: 'negative polygon size',
			text: good.replace('P,1.000000X6', 'P,-1X6'),
			line: 12,
			message: /polygon diameter must be a number ≥ 0/
		},
		{
			name: 'polygon with 2 vertices',
			text: good.replace('X6X30', 'X2X30'),
			line: 12,
			message: /vertex count must be an integer from 3 to 12/
		},
		{
			name: 'aperture defined twice',
			text: good.replace('%ADD13P', '%ADD10C,0.3*%\n%ADD13P'),
			line: 12,
			message: /aperture D10 is already defined at line 9/
		},
		{
			name: 'flash with no aperture selected',
			text: `${header}%ADD10C,1*%\nX0Y0D03*\nM02*\n`,
			line: 4,
			message: /flash with no aperture selected/
		}
	];
	for (const c of cases) {
		it(c.name, () => {
			const { errors } = failed(importGerberPasteLayer(c.text));
			const hit = errors.find((e) => c.message.test(e.message));
			expect(hit, JSON.stringify(errors)).toBeDefined();
			expect(hit?.line).toBe(c.line);
			// One message format: `line N, <what>: …` or `file, <what>: …` for the whole file.
			expect(hit?.message).toMatch(
				c.line > 0 ? new RegExp(`^line ${c.line}, [^:]+: `) : /^file, [^:]+: /
			);
		});
	}

	it('rejects a file over the size limit without parsing it', () => {
		const { errors } = failed(importGerberPasteLayer(good, { maxBytes: 100 }));
		expect(errors).toEqual([
			{ line: 0, message: expect.stringMatching(/^file, size: .* over the 0\.0 MB limit/) }
		]);
	});

	it('rejects a non-string input and a bad tolerance instead of crashing', () => {
		expect(failed(importGerberPasteLayer(null as unknown as string)).errors[0].message).toMatch(
			/must be text/
		);
		expect(failed(importGerberPasteLayer(good, { arcToleranceUm: 0 })).errors[0].message).toMatch(
			/arcToleranceUm/
		);
		expect(
			failed(importGerberPasteLayer(good, { arcToleranceUm: Number.NaN })).errors[0].message
		).toMatch(/arcToleranceUm/);
	});

	it('lists every error, sorted by line, not only the first', () => {
		const text = good.replace('D13*', 'D15*').replace('%LPD*%', '%XYZ*%');
		const { errors } = failed(importGerberPasteLayer(text));
		expect(errors.map((e) => e.line)).toEqual([7, 21]);
	});

	it('does not change its input and gives the same result twice (no hidden state)', () => {
		const text = readRef('macro-primitives.gbr');
		const copy = `${text}`;
		expect(importGerberPasteLayer(text)).toEqual(importGerberPasteLayer(text));
		expect(text).toBe(copy);
	});
});
