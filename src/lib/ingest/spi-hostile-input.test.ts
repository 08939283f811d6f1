import { describe, expect, it } from 'vitest';
import { CANONICAL_PROFILE, type MappingProfile } from './mapping-profile';
import { DEFAULT_SPI_PARSE_LIMITS, spiParseLimitsFromEnv } from './parse-limits';
import {
	createSpiRowParser,
	type SpiParseSummary,
	type SpiRowParserOptions
} from './spi-row-parser';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';
const T1 = '2026-03-02T08:00:00Z';
const GOOD = `RB-A,${T1},L1,PB-100,0,C1,1,100,100,120,0,0,pass`;
const encode = (text: string) => new TextEncoder().encode(text);

/** Parse as one string (text path) and as bytes in small chunks (byte path where it applies). */
function bothWays(
	text: string,
	profile: MappingProfile = CANONICAL_PROFILE,
	extra: Partial<SpiRowParserOptions> = {}
): SpiParseSummary {
	const asText = createSpiRowParser({ profile, fileName: 'hostile.csv', ...extra });
	asText.push(text);
	asText.end();
	const asBytes = createSpiRowParser({ profile, fileName: 'hostile.csv', ...extra });
	const bytes = encode(text);
	for (let i = 0; i < bytes.length; i += 7) asBytes.push(bytes.subarray(i, i + 7));
	asBytes.end();
	expect(asBytes.summary()).toEqual(asText.summary());
	return asBytes.summary();
}

function bytesOnly(chunks: Uint8Array[], extra: Partial<SpiRowParserOptions> = {}) {
	const parser = createSpiRowParser({
		profile: CANONICAL_PROFILE,
		fileName: 'hostile.csv',
		...extra
	});
	let rows = 0;
	for (const chunk of chunks) for (const b of parser.push(chunk)) rows += b.length;
	for (const b of parser.end()) rows += b.length;
	return { summary: parser.summary(), rows };
}

/** A row whose cells are replaced by index (0 = board_serial … 12 = result). */
function rowWith(changes: Record<number, string>): string {
	const cells = GOOD.split(',');
	for (const [i, v] of Object.entries(changes)) cells[Number(i)] = v;
	return cells.join(',');
}

const FIELDS = {
	volume_pct: 7,
	area_pct: 8,
	height_um: 9,
	offset_x_um: 10,
	offset_y_um: 11
} as const;

describe('numbers: plain decimal notation only, on both paths', () => {
	// Each would be a number to Number() or parseFloat(): 16, 3, 15, 1e308, Infinity, 1000, 12…
	it.each([
		['0x10', '"0x10"'],
		['0b11', '"0b11"'],
		['0o17', '"0o17"'],
		['Infinity', '"Infinity"'],
		['-Infinity', '"-Infinity"'],
		['NaN', '"NaN"'],
		['1_000', '"1_000"'],
		['+-1', '"+-1"'],
		['\uff11\uff12', '"\uff11\uff12"'], // full-width １２
		['\u00a012', '"\\u00A012"'], // no-break space before: shown, not hidden
		['12\u200b', '"12\\u200B"'], // zero-width space after
		['1e400', '"1e400"'],
		['1e1234', '"1e1234"'],
		['12abc', '"12abc"'],
		['1.2.3', '"1.2.3"'],
		['.', '"."'],
		['-', '"-"']
	])('%j is refused in every measure column, naming row, column and field', (cell, shown) => {
		for (const [field, index] of Object.entries(FIELDS)) {
			const summary = bothWays(`${HEADER}\n${GOOD}\n${rowWith({ [index]: cell })}\n`);
			expect(summary.errors).toEqual([
				{ row: 3, column: field, message: `${field} is not a number: ${shown}` }
			]);
			expect(summary.ok).toBe(false);
			expect(summary.boards).toEqual([]);
		}
	});

	it.each([
		['volume_pct', '1e308', 'volume_pct 1e+308 is outside 0 to 1000 %'],
		['volume_pct', '1000.01', 'volume_pct 1000.01 is outside 0 to 1000 %'],
		['area_pct', '-0.01', 'area_pct -0.01 is outside 0 to 1000 %'],
		['height_um', '2.5e3', 'height_um 2500 is outside 0 to 2000 µm'],
		['offset_x_um', '-5000.5', 'offset_x_um -5000.5 is outside -5000 to 5000 µm'],
		['offset_y_um', '1e5', 'offset_y_um 100000 is outside -5000 to 5000 µm']
	])('%s %s is outside its physical range, never clamped', (field, cell, message) => {
		const index = FIELDS[field as keyof typeof FIELDS];
		const summary = bothWays(`${HEADER}\n${rowWith({ [index]: cell })}\n`);
		expect(summary.errors).toEqual([{ row: 2, column: field, message }]);
	});

	it('accepts sign, spaces around, a point and a short exponent', () => {
		const text = `${HEADER}\n${rowWith({ 7: ' 99.5', 8: '+1.005e2', 9: '120 ', 10: '-2.5E1', 11: '.5' })}\n`;
		const parser = createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'x.csv' });
		const rows = [...parser.push(encode(text)), ...parser.end()];
		expect(parser.summary().errors).toEqual([]);
		expect([
			rows[0].volumePct[0],
			rows[0].areaPct[0],
			rows[0].heightUm[0],
			rows[0].offsetXUm[0],
			rows[0].offsetYUm[0]
		]).toEqual([99.5, 100.5, 120, -25, 0.5]);
	});

	it('names the column as the file writes it, and the field, through a profile', () => {
		const profile: MappingProfile = {
			...CANONICAL_PROFILE,
			delimiter: ';',
			decimalComma: true,
			columns: { volume_pct: 'Vol(%)', height_um: 'H' }
		};
		const header = HEADER.replace('volume_pct', 'Vol(%)').replace('height_um', 'H').split(',');
		const row = (vol: string, h: string) =>
			GOOD.split(',')
				.map((cell, i) => (i === 7 ? vol : i === 9 ? h : cell))
				.join(';');
		const summary = bothWays(
			[header.join(';'), row('99,5', '120'), row('1.5', '0x10'), row('1.234', '1,2')].join('\n'),
			profile
		);
		expect(summary.errors).toEqual([
			// With a decimal comma the point is a thousands separator: refused, not read as 1.5.
			{ row: 3, column: 'Vol(%)', message: 'volume_pct is not a number: "1.5"' },
			{ row: 3, column: 'H', message: 'height_um is not a number: "0x10"' },
			{ row: 4, column: 'Vol(%)', message: 'volume_pct is not a number: "1.234"' }
		]);
	});

	it('panel_index: plain digits 0–65535 only', () => {
		for (const cell of ['0x1', '1e2', '+1', '\uff11', '1.0', '65536']) {
			const summary = bothWays(`${HEADER}\n${rowWith({ 4: cell })}\n`);
			expect(summary.errors).toEqual([
				{
					row: 2,
					column: 'panel_index',
					message: `panel_index must be an integer 0 to 65535: "${cell}"`
				}
			]);
		}
	});

	it.each([
		'2026-03-02T08:00:00+15:00',
		'1969-12-31T23:59:59Z',
		'0099-03-02T08:00:00Z',
		'\uff12\uff10\uff12\uff16-03-02T08:00:00Z',
		'2026-03-02T08:00:60Z',
		'2026-02-29T08:00:00Z'
	])('timestamp %j is refused', (cell) => {
		const summary = bothWays(`${HEADER}\n${rowWith({ 1: cell })}\n`);
		expect(summary.errors).toEqual([
			{
				row: 2,
				column: 'inspected_at',
				message: `inspected_at is not a timestamp in format iso: "${cell}"`
			}
		]);
	});
});

describe('hostile bytes and budgets', () => {
	it('50 MB without a line feed is refused once the line passes 1 MiB, not buffered whole', () => {
		const chunk = new Uint8Array(64 * 1024).fill(0x61); // 'a' × 64 KiB, pushed 800 times
		const parser = createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'flat.csv' });
		parser.push(encode(`${HEADER}\n${GOOD}\n`));
		let pushedWhenRefused = -1;
		for (let i = 0; i < 800; i++) {
			parser.push(chunk);
			if (pushedWhenRefused < 0 && parser.summary().errorCount > 0) pushedWhenRefused = i + 1;
		}
		parser.end();
		// 16 chunks make exactly 1 MiB (still allowed); the 17th passes the limit.
		expect(pushedWhenRefused).toBe(17);
		expect(parser.summary().errors).toEqual([
			{
				row: 3,
				column: null,
				message:
					'line 3 is longer than the limit of 1 MiB (SPI_MAX_LINE_BYTES); is this a text export with line breaks?'
			}
		]);
		expect(parser.summary().ok).toBe(false);
	});

	it('one 50 MB chunk without a line feed, and the same as text, are refused at once', () => {
		const flat = new Uint8Array(50 * 1024 * 1024).fill(0x61);
		const { summary } = bytesOnly([flat]);
		expect(summary.errors).toEqual([
			{
				row: 1,
				column: null,
				message:
					'line 1 is longer than the limit of 1 MiB (SPI_MAX_LINE_BYTES); is this a text export with line breaks?'
			}
		]);
		const text = createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'flat.csv' });
		text.push(`${HEADER}\n`);
		text.push('a'.repeat(2 * 1024 * 1024));
		expect(text.summary().errors[0]?.message).toBe(
			'line 2 is longer than the limit of 1 MiB (SPI_MAX_LINE_BYTES); is this a text export with line breaks?'
		);
	});

	it('the line limit follows the option (a site may raise it)', () => {
		const long = `${HEADER}\n${rowWith({ 6: 'p'.repeat(90) })}\n`;
		expect(bytesOnly([encode(long)], { limits: { maxLineBytes: 100 } }).summary.errors).toEqual([
			{
				row: 1,
				column: null,
				message:
					'line 1 is longer than the limit of 100 bytes (SPI_MAX_LINE_BYTES); is this a text export with line breaks?'
			}
		]);
		expect(bytesOnly([encode(long)], { limits: { maxLineBytes: 1024 } }).summary.errors).toEqual(
			[]
		);
	});

	it('a NUL byte in a later chunk names its byte offset and line', () => {
		const head = encode(`${HEADER}\n${GOOD}\n`);
		const { summary, rows } = bytesOnly([head, encode('RB-A,2026\u0000')]);
		expect(summary.errors).toEqual([
			{
				row: 0,
				column: null,
				message: `file is not text: NUL byte at byte ${head.length + 9} (line 3); is it a binary export?`
			}
		]);
		expect(summary.ok).toBe(false);
		expect(rows).toBe(0);
	});

	it.each([
		['a lone continuation byte', [0x80], '0x80'],
		['an invalid lead byte', [0xff], '0xFF'],
		['an overlong slash', [0xc0, 0xaf], '0xC0'],
		['a UTF-16 surrogate', [0xed, 0xa0, 0x80], '0xED'],
		['a cut-off sequence', [0xc3, 0x2c], '0xC3']
	])('invalid UTF-8 (%s) names the byte and line', (_name, bad, shown) => {
		const head = encode(`${HEADER}\n${GOOD}\nRB-A,${T1},L1,PB-100,0,C`);
		const tail = encode(`,1,100,100,120,0,0,pass\n`);
		const file = new Uint8Array([...head, ...bad, ...tail]);
		const { summary } = bytesOnly([
			file.subarray(0, head.length + 1),
			file.subarray(head.length + 1)
		]);
		expect(summary.errors).toEqual([
			{
				row: 0,
				column: null,
				message: `file is not valid UTF-8 text (byte ${shown} at byte ${head.length}, line 3); save or export it as UTF-8`
			}
		]);
	});

	it('a header of thousands of columns is refused before it is split', () => {
		const wide = HEADER + ',x'.repeat(5000);
		const summary = bothWays(`${wide}\n${GOOD}\n`);
		expect(summary.errors).toEqual([
			{
				row: 1,
				column: null,
				message: 'header has 5013 columns, more than the limit of 1000 (SPI_MAX_COLUMNS)'
			}
		]);
		expect(summary.dataRows).toBe(0);
	});

	it('a quoted header over the column limit is refused too', () => {
		const wide = HEADER + ',"x"'.repeat(1000);
		expect(bothWays(`${wide}\n`).errors[0]?.message).toBe(
			'header has 1013 columns, more than the limit of 1000 (SPI_MAX_COLUMNS)'
		);
	});

	it('more board inspections than the budget stop the file at the first one over', () => {
		const lines = [HEADER];
		for (let i = 0; i < 30; i++) lines.push(rowWith({ 0: `RB-${i}` }));
		const summary = bothWays(lines.join('\n') + '\n', CANONICAL_PROFILE, {
			limits: { maxBoards: 25 }
		});
		expect(summary.errors).toEqual([
			{
				row: 27,
				column: 'board_serial',
				message:
					'board inspection RB-25 is one more than the limit of 25 per file (SPI_MAX_BOARDS_PER_FILE); split the export'
			}
		]);
		expect(summary.ok).toBe(false);
		expect(summary.boards).toEqual([]);
	});

	it(`the default budget holds ${DEFAULT_SPI_PARSE_LIMITS.maxBoards} one-pad boards and refuses one more`, () => {
		const max = DEFAULT_SPI_PARSE_LIMITS.maxBoards;
		const parser = createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'many.csv' });
		parser.push(encode(HEADER + '\n'));
		let text = '';
		for (let i = 0; i <= max; i++) {
			text += `RB-${i},${T1},L1,PB-100,0,C1,1,100,100,120,0,0,pass\n`;
			if (text.length > 60_000) {
				parser.push(encode(text));
				text = '';
			}
		}
		parser.push(encode(text));
		parser.end();
		const summary = parser.summary();
		expect(summary.rowsAccepted).toBe(max);
		expect(summary.errors).toEqual([
			{
				row: max + 2,
				column: 'board_serial',
				message: `board inspection RB-${max} is one more than the limit of ${max} per file (SPI_MAX_BOARDS_PER_FILE); split the export`
			}
		]);
	});

	it('refuses limits that are not positive integers', () => {
		expect(() =>
			createSpiRowParser({
				profile: CANONICAL_PROFILE,
				fileName: 'x.csv',
				limits: { maxBoards: 0 }
			})
		).toThrow('createSpiRowParser requires a positive integer maxBoards, got 0');
	});
});

describe('spiParseLimitsFromEnv', () => {
	it('reads plain positive integers and keeps defaults for the rest', () => {
		expect(
			spiParseLimitsFromEnv({ SPI_MAX_LINE_BYTES: '4194304', SPI_MAX_BOARDS_PER_FILE: ' 200000 ' })
		).toEqual({
			limits: { maxLineBytes: 4194304, maxColumns: 1000, maxBoards: 200000 },
			problems: []
		});
	});

	it.each(['0', '-1', '1e6', '0x100', '1_000', '12.5', 'lots'])(
		'%j is refused, default kept',
		(raw) => {
			expect(spiParseLimitsFromEnv({ SPI_MAX_COLUMNS: raw })).toEqual({
				limits: { ...DEFAULT_SPI_PARSE_LIMITS },
				problems: [
					`SPI_MAX_COLUMNS=${JSON.stringify(raw)} is not a positive whole number; using 1000`
				]
			});
		}
	);
});
