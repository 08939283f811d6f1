/**
 * The broken-file corpus in tests/fixtures/spi: each file is parsed whole and in small byte
 * chunks (so line breaks, CRLF pairs and multi-byte characters fall across chunk borders), and
 * the exact errors or parsed values are asserted.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import check from '../../../reference/ingest/aggregate-check-values.json';
import units from '../../../reference/ingest/unit-check-values.json';
import { mappingProfileSchema } from '../schemas/ingest';
import { encodeCentis } from './encode-centis';
import { CANONICAL_PROFILE, type MappingProfile } from './mapping-profile';
import { batchToRows, type SpiRow } from './spi-row-batch';
import { createSpiRowParser, type SpiParseSummary } from './spi-row-parser';

const dir = new URL('../../../tests/fixtures/spi/', import.meta.url);
const bytesOf = (name: string) => new Uint8Array(readFileSync(new URL(name, dir)));
const profileOf = (name: string): MappingProfile =>
	mappingProfileSchema.parse(JSON.parse(readFileSync(new URL(name, dir), 'utf8')));

interface Parsed {
	summary: SpiParseSummary;
	rows: SpiRow[];
}

function parse(
	name: string,
	profile: MappingProfile = CANONICAL_PROFILE,
	chunkSize = Infinity
): Parsed {
	const parser = createSpiRowParser({ profile, fileName: name, batchSize: 4 });
	const bytes = bytesOf(name);
	const batches = [];
	const step = Math.min(chunkSize, Math.max(bytes.length, 1));
	for (let i = 0; i < bytes.length; i += step)
		batches.push(...parser.push(bytes.subarray(i, i + step)));
	batches.push(...parser.end());
	return {
		summary: parser.summary(),
		rows: batches.flatMap((b) => batchToRows(b, parser.boards()))
	};
}

/** Parse whole and in 1-, 3- and 7-byte chunks; all must agree. */
function parseAllWays(name: string, profile?: MappingProfile): Parsed {
	const whole = parse(name, profile);
	for (const size of [1, 3, 7]) {
		const chunked = parse(name, profile, size);
		expect(chunked.summary, `${name} in ${size}-byte chunks`).toEqual(whole.summary);
		expect(chunked.rows).toEqual(whole.rows);
	}
	return whole;
}

const iso = (ms: number) => new Date(ms).toISOString();

describe('good canonical file', () => {
	for (const name of ['good-canonical.csv', 'bom.csv', 'crlf.csv']) {
		it(`${name} parses to 2 boards × 3 pads`, () => {
			const { summary, rows } = parseAllWays(name);
			expect(summary.ok).toBe(true);
			expect(summary.errorCount).toBe(0);
			expect(summary.warningCount).toBe(0);
			expect(summary.delimiter).toBe(',');
			expect(summary.header[0]).toBe('board_serial'); // BOM removed
			expect(summary.rowsAccepted).toBe(6);
			expect(
				rows.map((r) => [r.line, r.boardSerial, r.refdes, r.pad, r.panelIndex, r.result])
			).toEqual([
				[2, 'RB-TESTBOARD-0001', 'C1', '1', 0, 0],
				[3, 'RB-TESTBOARD-0001', 'C1', '2', 0, 0],
				[4, 'RB-TESTBOARD-0001', 'R7', '1', 1, 2], // FAIL, upper case
				[5, 'RB-TESTBOARD-0002', 'C1', '1', 0, 0], // Pass, mixed case
				[6, 'RB-TESTBOARD-0002', 'C1', '2', 0, 1],
				[7, 'RB-TESTBOARD-0002', 'R7', '1', 1, 0]
			]);
			expect(rows[0]).toEqual({
				line: 2,
				boardSerial: 'RB-TESTBOARD-0001',
				inspectedAtMs: Date.UTC(2026, 2, 2, 8, 0, 0),
				lineCode: 'L1',
				productCode: 'PB-100',
				panelIndex: 0,
				refdes: 'C1',
				pad: '1',
				volumePct: 98.5,
				areaPct: 101.2,
				heightUm: 121.4,
				offsetXUm: 5.5,
				offsetYUm: -3.25,
				result: 0
			});
			// 08:00:20+01:00 is 07:00:20 UTC.
			expect(iso(rows[3].inspectedAtMs)).toBe('2026-03-02T07:00:20.000Z');
			expect(
				summary.boards.map((b) => [b.index, b.boardSerial, b.firstLine, b.aggregate.rows])
			).toEqual([
				[0, 'RB-TESTBOARD-0001', 2, 3],
				[1, 'RB-TESTBOARD-0002', 5, 3]
			]);
			// Aggregates against the exact two-pass values (reference/ingest/aggregate-check-values.json).
			for (const board of summary.boards) {
				const expected = check.boards[board.boardSerial as keyof typeof check.boards];
				expect(board.aggregate.results).toEqual(expected.results);
				expect(board.aggregate.volumePct.sd).toBeCloseTo(expected.volumePct.sd, 10);
				expect(board.aggregate.heightUm.mean).toBeCloseTo(expected.heightUm.mean, 10);
				expect(board.aggregate.offsetYUm.range).toBeCloseTo(expected.offsetYUm.range, 10);
			}
		});
	}

	it('stores every value exactly as centis (≤ 2 decimals in the file)', () => {
		const { rows } = parse('good-canonical.csv');
		const text = readFileSync(new URL('good-canonical.csv', dir), 'utf8')
			.trim()
			.split('\n')
			.slice(1);
		rows.forEach((row, i) => {
			const cells = text[i].split(',');
			expect(encodeCentis(row.volumePct) / 100).toBe(Number(cells[7]));
			expect(encodeCentis(row.heightUm) / 100).toBe(Number(cells[9]));
			expect(encodeCentis(row.offsetYUm) / 100).toBe(Number(cells[11]));
		});
	});
});

describe('broken files', () => {
	it('empty.csv → one file-level error', () => {
		const { summary, rows } = parseAllWays('empty.csv');
		expect(summary.ok).toBe(false);
		expect(summary.errors).toEqual([{ row: 0, column: null, message: 'file is empty' }]);
		expect(rows).toEqual([]);
	});

	it('header-only.csv → no data rows', () => {
		const { summary } = parseAllWays('header-only.csv');
		expect(summary.ok).toBe(false);
		expect(summary.errors).toEqual([
			{ row: 0, column: null, message: 'no data rows (the file has only a header)' }
		]);
	});

	it('wrong-columns.csv → each required column named missing, unknown columns warned', () => {
		const { summary, rows } = parseAllWays('wrong-columns.csv');
		expect(summary.ok).toBe(false);
		expect(summary.errorCount).toBe(13);
		expect(summary.errors.map((e) => e.column)).toEqual([
			'board_serial',
			'inspected_at',
			'line',
			'product',
			'panel_index',
			'refdes',
			'pad',
			'volume_pct',
			'area_pct',
			'height_um',
			'offset_x_um',
			'offset_y_um',
			'result'
		]);
		expect(summary.errors[0]).toEqual({
			row: 1,
			column: 'board_serial',
			message: 'required column "board_serial" is missing'
		});
		expect(summary.warnings).toEqual([
			{ row: 1, column: 'id', message: 'unknown column "id" ignored' },
			{ row: 1, column: 'name', message: 'unknown column "name" ignored' },
			{ row: 1, column: 'value', message: 'unknown column "value" ignored' }
		]);
		expect(summary.dataRows).toBe(0); // nothing read after a bad header
		expect(rows).toEqual([]);
	});

	it('missing-columns.csv → height_um and result missing', () => {
		const { summary } = parseAllWays('missing-columns.csv');
		expect(summary.errors).toEqual([
			{ row: 1, column: 'height_um', message: 'required column "height_um" is missing' },
			{ row: 1, column: 'result', message: 'required column "result" is missing' }
		]);
	});

	const nonNumericErrors = [
		{ row: 3, column: 'volume_pct', message: 'volume_pct is not a number: "abc"' },
		{ row: 4, column: 'area_pct', message: 'area_pct is not a number: ""' },
		{ row: 4, column: 'height_um', message: 'height_um 2500 is outside 0 to 2000 µm' },
		{ row: 5, column: 'panel_index', message: 'panel_index must be an integer 0 to 65535: "x"' },
		{ row: 5, column: 'volume_pct', message: 'volume_pct 1200 is outside 0 to 1000 %' },
		{ row: 5, column: 'offset_x_um', message: 'offset_x_um 5001 is outside -5000 to 5000 µm' },
		{ row: 5, column: 'offset_y_um', message: 'offset_y_um -5000.01 is outside -5000 to 5000 µm' },
		{
			row: 5,
			column: 'result',
			message: 'unknown result "maybe" (expected one of: pass, warn, fail)'
		},
		{ row: 6, column: 'refdes', message: 'refdes is empty' },
		{ row: 7, column: 'board_serial', message: 'board_serial is empty' },
		{ row: 8, column: 'panel_index', message: 'panel_index must be an integer 0 to 65535: "-1"' },
		{ row: 8, column: 'volume_pct', message: 'volume_pct -0.5 is outside 0 to 1000 %' },
		{ row: 8, column: 'offset_x_um', message: 'offset_x_um is not a number: "Infinity"' }
	];

	it('non-numeric.csv → every bad cell reported; reject-file imports nothing', () => {
		const { summary, rows } = parseAllWays('non-numeric.csv');
		expect(summary.errors).toEqual(nonNumericErrors);
		expect(summary.ok).toBe(false);
		expect(summary.rowsRejected).toBe(6);
		expect(summary.rowsAccepted).toBe(1); // line 2 passed its checks, but nothing is imported
		expect(summary.boards).toEqual([]);
		expect(rows).toEqual([]); // batches are size 4, but the first bad row is line 3
	});

	it('non-numeric.csv with skip-row keeps the one good row', () => {
		const { summary, rows } = parseAllWays('non-numeric.csv', {
			...CANONICAL_PROFILE,
			onBadRow: 'skip-row'
		});
		expect(summary.errors).toEqual(nonNumericErrors);
		expect(summary.ok).toBe(true);
		expect(summary.rowsAccepted).toBe(1);
		expect(rows.map((r) => r.line)).toEqual([2]);
		expect(summary.boards[0].aggregate.rows).toBe(1);
	});

	it('bad-timestamps.csv → impossible date, wrong format, empty, hour 25', () => {
		const { summary } = parseAllWays('bad-timestamps.csv');
		const msg = (t: string) => `inspected_at is not a timestamp in format iso: "${t}"`;
		expect(summary.errors).toEqual([
			{ row: 3, column: 'inspected_at', message: msg('2026-02-30T08:00:00Z') },
			{ row: 4, column: 'inspected_at', message: msg('02.03.2026 08:00:00') },
			{ row: 5, column: 'inspected_at', message: msg('') },
			{ row: 6, column: 'inspected_at', message: msg('2026-03-02T25:00:00Z') }
		]);
	});

	it('truncated-last-line.csv → field-count error on the cut-off line', () => {
		const { summary } = parseAllWays('truncated-last-line.csv');
		expect(summary.errors).toEqual([
			{ row: 4, column: null, message: 'row has 10 fields, header has 13 (cut-off line?)' }
		]);
		expect(summary.ok).toBe(false);
	});

	it('binary-garbage.csv → one file-level error', () => {
		const { summary } = parse('binary-garbage.csv');
		// Bytes 89 50 4E 47 0D 0A 1A 0A 00 …: the NUL is byte 8, after two line feeds.
		expect(summary.errors).toEqual([
			{
				row: 0,
				column: null,
				message: 'file is not text: NUL byte at byte 8 (line 3); is it a binary export?'
			}
		]);
		// Fed byte by byte the lone 0x89 (a UTF-8 continuation byte) is caught first.
		expect(parse('binary-garbage.csv', CANONICAL_PROFILE, 1).summary.errors).toEqual([
			{
				row: 0,
				column: null,
				message:
					'file is not valid UTF-8 text (byte 0x89 at byte 0, line 1); save or export it as UTF-8'
			}
		]);
	});

	it('latin1-header.csv (Windows-1252 µ) → not UTF-8, with the byte and line', () => {
		const { summary } = parse('latin1-header.csv');
		// "board_serial,height (" is 21 bytes, so the 0xB5 is byte 21.
		expect(summary.errors).toEqual([
			{
				row: 0,
				column: null,
				message:
					'file is not valid UTF-8 text (byte 0xB5 at byte 21, line 1); save or export it as UTF-8'
			}
		]);
	});
});

describe('layout variations', () => {
	it('extra-columns.csv → order and case free, optional columns read, unknown ones warned', () => {
		const { summary, rows } = parseAllWays('extra-columns.csv');
		expect(summary.ok).toBe(true);
		expect(summary.warnings).toEqual([
			{ row: 1, column: 'operator', message: 'unknown column "operator" ignored' },
			{ row: 1, column: 'notes', message: 'unknown column "notes" ignored' }
		]);
		expect(rows.map((r) => [r.refdes, r.result, r.volumeUm3, r.stencil, r.printRun])).toEqual([
			['C1', 0, 2890000, 'ST-0007', 'RUN-0042'],
			['R7', 2, undefined, 'ST-0007', 'RUN-0042']
		]);
		expect(summary.boards[0].stencil).toBe('ST-0007');
	});

	it('quoted-commas.csv → commas, doubled quotes and a line break inside quotes', () => {
		const { summary, rows } = parseAllWays('quoted-commas.csv');
		expect(summary.errors).toEqual([]);
		expect(rows.map((r) => [r.line, r.productCode, r.refdes, r.pad, r.volumePct])).toEqual([
			[2, 'PB-100, rev "B"', 'C1,C2', '1', 98.5],
			[3, 'PB-100, rev "B"', 'U4\n(split)', 'A1', 99.5],
			[5, 'PB-100, rev "B"', 'R1', '1', 100]
		]);
	});

	it('example-x1-semicolon.csv with its profile → semicolons, decimal comma, mm, Berlin time', () => {
		const profile = profileOf('example-x1.profile.json');
		const { summary, rows } = parseAllWays('example-x1-semicolon.csv', profile);
		expect(summary.errors).toEqual([]);
		expect(summary.delimiter).toBe(';');
		expect(
			rows.map((r) => [r.boardSerial, r.lineCode, r.productCode, r.panelIndex, r.refdes, r.result])
		).toEqual([
			['RB-TESTBOARD-0011', 'L2', 'PB-100', 1, 'C1', 0],
			['RB-TESTBOARD-0011', 'L2', 'PB-100', 1, 'C1', 0],
			['RB-TESTBOARD-0011', 'L2', 'PB-100', 2, 'R7', 2],
			['RB-TESTBOARD-0012', 'L2', 'PB-100', 1, 'C1', 1]
		]);
		// 09:15 CET (UTC+1) = 08:15Z; 29 Mar 2026 02:30 falls in the Berlin DST gap → 03:30 CEST = 01:30Z.
		expect(iso(rows[0].inspectedAtMs)).toBe('2026-03-02T08:15:00.000Z');
		expect(iso(rows[3].inspectedAtMs)).toBe('2026-03-29T01:30:00.000Z');
		expect(rows[0].volumePct).toBe(98.5);
		expect(rows[1].volumePct).toBe(102.25);
		// mm → µm (reference/ingest/unit-check-values.json); stored as exact hundredths.
		const mm = units.cases.filter((c) => c.fixture === 'example-x1-semicolon.csv');
		const got = [rows[0].heightUm, rows[0].offsetXUm, rows[0].offsetYUm, rows[2].offsetXUm];
		mm.forEach((c, i) => {
			expect(got[i]).toBeCloseTo(c.um as number, 9);
			expect(encodeCentis(got[i])).toBe(Math.round((c.um as number) * 100));
		});
	});

	it('one file per board, serial from the file name, tab, mil and mil³, New York time', () => {
		const profile = profileOf('per-board-tsv.profile.json');
		const { summary, rows } = parseAllWays('RB-TESTBOARD-0021_20260308.tsv', profile);
		expect(summary.errors).toEqual([]);
		expect(summary.delimiter).toBe('\t');
		expect(
			summary.boards.map((b) => [b.boardSerial, b.lineCode, b.productCode, iso(b.inspectedAtMs)])
		).toEqual([
			// 01:30 EST (UTC−5), before the 02:00 switch on 8 Mar 2026.
			['RB-TESTBOARD-0021', 'L3', 'PB-200', '2026-03-08T06:30:00.000Z']
		]);
		expect(rows.map((r) => [r.refdes, r.pad, r.result])).toEqual([
			['C1', '1', 0],
			['C1', '2', 1],
			['U4', 'A1', 2]
		]);
		expect(rows.every((r) => Number.isNaN(r.volumePct))).toBe(true); // absolute mode
		const c = units.cases.filter((x) => x.fixture === 'RB-TESTBOARD-0021_20260308.tsv');
		const byInput = Object.fromEntries(c.map((x) => [x.input, x.um ?? x.um3]));
		expect(rows[0].heightUm).toBeCloseTo(byInput['4.8 mil'], 9);
		expect(rows[1].heightUm).toBeCloseTo(byInput['4.75 mil'], 9);
		expect(rows[0].offsetXUm).toBeCloseTo(byInput['0.2 mil'], 9);
		expect(rows[0].offsetYUm).toBeCloseTo(byInput['-0.15 mil'], 9);
		expect(rows[1].offsetXUm).toBeCloseTo(byInput['-0.1 mil'], 9);
		expect(rows[1].offsetYUm).toBeCloseTo(byInput['0.05 mil'], 9);
		expect(rows[0].volumeUm3).toBeCloseTo(byInput['180.5 mil³'], 6);
		expect(rows[1].volumeUm3).toBeCloseTo(byInput['175.25 mil³'], 6);
		expect(summary.boards[0].aggregate.volumePct.count).toBe(0);
	});

	it('a file name that does not fit the serial pattern is a file-level error', () => {
		const profile = profileOf('per-board-tsv.profile.json');
		const parser = createSpiRowParser({ profile, fileName: '/uploads/board.tsv' });
		parser.push(bytesOf('RB-TESTBOARD-0021_20260308.tsv'));
		parser.end();
		expect(parser.summary().errors).toEqual([
			{
				row: 0,
				column: null,
				message:
					'file name "board.tsv" does not match the serial pattern /^(RB-[A-Z]+-\\d{4})_\\d{8}\\.tsv$/'
			}
		]);
	});
});
