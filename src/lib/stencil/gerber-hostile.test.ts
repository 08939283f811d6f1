/**
 * Hostile Gerber input (issue 11): every file that asks for too much work is refused before the
 * work, naming the line and the limit; every loosely written number is refused naming the line.
 */
import { describe, expect, it } from 'vitest';
import { importGerberPasteLayer, type GerberImportFailure } from './gerber-import';
import { scanGerberText } from './gerber-scan';
import { DEFAULT_STENCIL_LIMITS, withLimits } from './limits';

const H = '%FSLAX26Y26*%\n%MOMM*%\n';
const failed = (text: string, limits = DEFAULT_STENCIL_LIMITS): GerberImportFailure => {
	const r = importGerberPasteLayer(text, { limits });
	if (!('errors' in r)) throw new Error(`expected a failure, got ${r.apertures.length} apertures`);
	return r;
};
const circle = (n: number, r: number) =>
	Array.from({ length: n }, (_, k) => {
		const a = (2 * Math.PI * k) / n;
		return `X${Math.round(r * Math.cos(a))}Y${Math.round(r * Math.sin(a))}D01*`;
	}).join('\n');

describe('work budgets: refused before the work, naming line and limit', () => {
	it('a 91-byte step-and-repeat asking for 10,000 × 10,000 copies (413, line 3)', () => {
		const text = `${H}%SRX10000Y10000I1J1*%\n%ADD10C,0.1*%\nD10*\nX0Y0D03*\nM02*\n`;
		const r = failed(text);
		expect(r.overBudget).toBe(true);
		expect(r.errors.map((e) => e.message)).toEqual([
			'line 3, %SR: step-and-repeat asks for 100,000,000 copies; the limit is 50,000 openings per layer'
		]);
	});

	it('1,000 × 1,000 copies, and flashes × copies over the openings budget', () => {
		expect(
			failed(`${H}%SRX1000Y1000I1J1*%\n%ADD10C,0.1*%\nD10*\nX0Y0D03*\nM02*\n`).errors[0].message
		).toMatch(/^line 3, %SR: step-and-repeat asks for 1,000,000 copies/);
		// 100 × 100 copies are allowed, but six flashes of them make 60,000 openings.
		const flashes = Array.from({ length: 6 }, (_, k) => `X${k * 1000}Y0D03*`).join('\n');
		const r = failed(`${H}%SRX100Y100I1J1*%\n%ADD10C,0.1*%\nD10*\n${flashes}\n%SR*%\nM02*\n`);
		expect(r.overBudget).toBe(true);
		expect(r.errors[0].line).toBe(11);
		expect(r.errors[0].message).toMatch(
			/more than 50,000 openings .* the limit is 50,000 openings per layer/
		);
	});

	it('a region outline of 16,000 vertices (the documented limit is 1,000 per outline)', () => {
		const r = failed(
			`${H}%ADD10C,0.1*%\nG36*\nX1000000Y0D02*\n${circle(16_000, 1_000_000)}\nG37*\nM02*\n`
		);
		expect(r.overBudget).toBe(true);
		expect(r.errors[0].message).toBe(
			'line 4, G36: contour 1 has more than 1,000 vertices (arcs counted by their chords); ' +
				'the limit is 1,000 per outline'
		);
	});

	it('a region of few arcs that would be cut into too many chords is refused by the count', () => {
		// 40 full circles of radius 50 mm: each needs the most chords per turn (1,024).
		const arcs = Array.from({ length: 40 }, () => 'G03X50000000Y0I-50000000J0D01*').join('\n');
		const r = failed(`${H}G75*\nG36*\nX50000000Y0D02*\n${arcs}\nG37*\nM02*\n`);
		expect(r.errors[0]).toMatchObject({ line: 4, budget: true });
		expect(r.errors[0].message).toMatch(/contour 1 has more than 1,000 vertices/);
	});

	it('a region with more segments than the budget stops at the segment that passes it', () => {
		const r = failed(
			`${H}G36*\nX0Y0D02*\n${circle(200, 1_000_000)}\nG37*\nM02*\n`,
			withLimits({ maxRegionSegments: 100 })
		);
		expect(r.errors[0]).toMatchObject({ line: 105, budget: true });
		expect(r.errors[0].message).toMatch(/region opened at line 3 has more than 100 segments/);
	});

	it('a macro with a huge primitive count, and an outline primitive asking for many vertices', () => {
		const prims = Array.from({ length: 150 }, (_, k) => `1,1,0.1,${k / 100},0*`).join('\n');
		const many = failed(`${H}%AMMANY*\n${prims}%\n%ADD10MANY*%\nD10*\nX0Y0D03*\nM02*\n`);
		expect(many.overBudget).toBe(true);
		expect(many.errors[0].message).toBe(
			'line 3, %AMMANY: the macro has more than 100 primitives; the limit is 100 per macro'
		);
		const outline = failed(
			`${H}%AMBIG*\n4,1,50000,0,0,1,0,1,1,0,0,0*%\n%ADD10BIG*%\nD10*\nX0Y0D03*\nM02*\n`
		);
		expect(outline.errors[0].message).toMatch(
			/^line 4, %AMBIG: a primitive asks for 50,000 vertices; the limit is 1,000 per outline$/
		);
	});

	it('a long line with no "*" or newline ends the scan at the word limit', () => {
		const r = failed(`${H}%ADD10C,0.1*%\nD10*\nX${'1'.repeat(100_000)}`);
		expect(r.errors[0].message).toMatch(/^line 5, command: a command runs past 65,536 characters/);
	});

	it('polygon vertices of the whole layer are counted against the per-import budget', () => {
		const flashes = Array.from({ length: 30 }, (_, k) => `X${k * 2000000}Y0D03*`).join('\n');
		const r = failed(
			`${H}%ADD10P,1X12*%\nD10*\n${flashes}\nM02*\n`,
			withLimits({ maxVerticesPerImport: 300 })
		);
		expect(r.overBudget).toBe(true);
		expect(r.errors[0]).toMatchObject({ line: 30 });
		expect(r.errors[0].message).toMatch(/more than 300 vertices .* the limit is 300 per import/);
	});
});

describe('strict numbers: refused naming the line, never read loosely', () => {
	const cases: [string, string, RegExp][] = [
		[
			'C,1e308 (was read as 1 mm)',
			`${H}%ADD10C,1e308*%`,
			/^line 3, %ADD10: parameter 1 "1e308" is not a plain decimal number/
		],
		[
			'C,0x10 (hex)',
			`${H}%ADD10C,0x10*%`,
			/^line 3, %ADD10: parameter 1 "0x10" is not a plain decimal/
		],
		[
			'P rotation 1e308',
			`${H}%ADD10P,1X5X1e308*%`,
			/^line 3, %ADD10: parameter 3 "1e308" is not a plain decimal/
		],
		[
			'P rotation 400°',
			`${H}%ADD10P,1X5X400*%`,
			/^line 3, %ADD10: rotation 400° is outside -360..360°/
		],
		[
			'a 200 mm circle',
			`${H}%ADD10C,200*%`,
			/^line 3, %ADD10: parameter 1 \(200 mm\) is outside 1 µm..100 mm/
		],
		[
			'a 0.5 µm circle',
			`${H}%ADD10C,0.0005*%`,
			/^line 3, %ADD10: parameter 1 \(0.0005 mm\) is outside 1 µm..100 mm/
		],
		[
			'an inch rectangle of 5 in',
			'%FSLAX26Y26*%\n%MOIN*%\n%ADD10R,5X0.1*%',
			/^line 3, %ADD10: parameter 1 \(5 in\) is outside/
		],
		[
			'a 40-digit coordinate (was clamped)',
			`${H}%ADD10C,0.1*%\nD10*\nX${'1234567890'.repeat(4)}Y0D03*`,
			/^line 5, X \(column 1\): coordinate has 40 digits; %FS \(line 1\) declares 2 integer \+ 6 decimal digits$/
		],
		[
			'a coordinate with a decimal point',
			`${H}%ADD10C,0.1*%\nD10*\nX0Y1.5D03*`,
			/^line 5, Y \(column 3\): coordinate "1.5" is not a whole number/
		],
		[
			'a coordinate in exponent form',
			`${H}%ADD10C,0.1*%\nD10*\nX1e5Y0D03*`,
			/^line 5, X \(column 1\): coordinate "1e5" is not a whole number/
		],
		[
			'a coordinate beyond 2 m',
			'%FSLAX46Y46*%\n%MOMM*%\n%ADD10C,0.1*%\nD10*\nX2500000000Y0D03*',
			/^line 5, X \(column 1\): coordinate 2500000000 is beyond ±2000 mm/
		],
		[
			'a step count with an exponent',
			`${H}%SRX1e3Y1I1J1*%`,
			/^line 3, %SR: the repeat counts X and Y must be whole numbers ≥ 1 \(got X1e3 Y1\)/
		],
		[
			'a step distance in hex',
			`${H}%SRX2Y1I0x10J1*%`,
			/^line 3, %SR: the step I must be a plain decimal ≥ 0 \(got "0x10"\)/
		],
		[
			'an exponent inside a macro',
			`${H}%AMM*\n1,1,1e308,0,0*%`,
			/^line 4, %AMM: unexpected character "e" in a primitive/
		]
	];
	for (const [name, head, message] of cases)
		it(name, () => {
			const r = failed(`${head}\nM02*\n`);
			expect(r.overBudget).toBeUndefined();
			expect(r.errors[0].message).toMatch(message);
		});

	it('NUL bytes and invalid UTF-8 (decoded as U+FFFD) are binary data, with line and column', () => {
		expect(failed(`${H}%ADD10C,0.1*%\nD1\u00000*\n`).errors[0].message).toBe(
			'line 4, column 3: binary data (U+0000); this is not a text Gerber file'
		);
		expect(failed(`${H}G04 caf\uFFFD*\n`).errors[0].message).toMatch(
			/^line 3, column 8: binary data \(U\+FFFD\)/
		);
	});

	it('the plain numbers of a good file pass the scan untouched', () => {
		const text = `${H}%ADD10C,.5*%\n%ADD11R,1.X+0.25*%\n%AMRR*\n0 rounded $1 x 2*\n21,1,$1,$2,0,0,$3*\n1,1,$2x2,-$1/2,0*%\n%ADD12RR,1X0.5X45*%\n%SRX3Y2I2.0J1.5*%\nD10*\nX-1000000Y+2500000D03*\n%SR*%\nM02*\n`;
		expect(scanGerberText(text, DEFAULT_STENCIL_LIMITS, 50).errors).toEqual([]);
	});
});

describe('geometry after unit conversion and open contours (issue 15)', () => {
	it('an open region contour is closed with a straight edge, with a warning naming its line', () => {
		const r = importGerberPasteLayer(
			`${H}G36*\nX0Y0D02*\nG01X1000000D01*\nY1000000D01*\nG37*\nM02*\n`
		);
		if ('errors' in r) throw new Error(JSON.stringify(r.errors));
		expect(r.warnings).toEqual([
			'line 3, G36 contour 1: the contour is not closed (its last point differs from its first); ' +
				'closed with a straight edge back to its start'
		]);
		// The right triangle with legs of 1 mm: area 0.5 mm² (first principles).
		expect(r.apertures).toHaveLength(1);
		const v = r.apertures[0].verticesUm!;
		let twice = 0;
		for (let i = 0; i < v.length; i++)
			twice += v[i][0] * v[(i + 1) % v.length][1] - v[(i + 1) % v.length][0] * v[i][1];
		expect(Math.abs(twice / 2)).toBeCloseTo(500_000, 3);
	});
});

describe('macro work per layer', () => {
	// A 99-circle macro whose first circle's diameter is the parameter $1.
	const macro = `%AMMR*\n1,1,$1,0,0*\n${Array.from({ length: 98 }, (_, k) => `1,1,0.1,${((k + 1) / 100).toFixed(2)},0*`).join('\n')}%\n`;
	const tools = (n: number, distinct: boolean) =>
		Array.from(
			{ length: n },
			(_, k) =>
				`%ADD${10 + k}MR,${distinct ? (0.1 + k / 10_000).toFixed(4) : '0.1'}*%\nD${10 + k}*\nX${k * 1000}Y0D03*`
		).join('\n');

	it('one shape flashed through 2,000 D-codes is computed once', () => {
		const r = importGerberPasteLayer(`${H}${macro}${tools(2_000, false)}\nM02*\n`);
		if ('errors' in r) throw new Error(JSON.stringify(r.errors.slice(0, 2)));
		expect(r.apertures).toHaveLength(2_000);
	});

	it('distinct macro shapes are counted against the per-layer primitive budget (413)', () => {
		const r = failed(`${H}${macro}${tools(300, true)}\nM02*\n`);
		expect(r.overBudget).toBe(true);
		// The 203rd distinct shape passes 20,000 primitives (202 × 99 = 19,998); it is defined on
		// line 2 + 100 (macro) + 3 × 202 + 1.
		expect(r.errors[0]).toMatchObject({ line: 709, budget: true });
		expect(r.errors[0].message).toBe(
			'line 709, D212: the macro apertures of the layer reach more than 20,000 primitives of ' +
				'distinct shapes; the limit is 20,000 per layer'
		);
	});
});

describe('macro variables', () => {
	it('a chain of variables $2 = $1 × $1 … is read; defining $10 and up is named, not lost', () => {
		const ok = importGerberPasteLayer(
			`${H}%AMV*\n$2=$1x$1*\n1,1,$2,0,0*%\n%ADD10V,0.5*%\nD10*\nX0Y0D03*\nM02*\n`
		);
		if ('errors' in ok) throw new Error(JSON.stringify(ok.errors));
		expect(ok.apertures[0]).toMatchObject({ shape: 'circle', diameterUm: 250 });
		const vars = Array.from({ length: 90 }, (_, k) => `$${k + 2}=$${k + 1}x$${k + 1}*`).join('\n');
		const r = failed(`${H}%AMV*\n${vars}\n1,1,$91,0,0*%\n%ADD10V,2*%\nD10*\nX0Y0D03*\nM02*\n`);
		expect(r.errors[0].message).toBe(
			'line 12, %AMV: defining $10: macro variables from $10 up cannot be defined here'
		);
		// Ten parameters, the tenth used as $10: read correctly.
		const tenth = importGerberPasteLayer(
			`${H}%AMV*\n1,1,$10,0,0*%\n%ADD10V,0.7X1X1X1X1X1X1X1X1X0.5*%\nD10*\nX0Y0D03*\nM02*\n`
		);
		if ('errors' in tenth) throw new Error(JSON.stringify(tenth.errors));
		expect(tenth.apertures[0]).toMatchObject({ shape: 'circle', diameterUm: 500 });
	});
});
