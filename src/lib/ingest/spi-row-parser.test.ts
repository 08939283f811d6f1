import { describe, expect, it } from 'vitest';
import { CANONICAL_PROFILE, type MappingProfile } from './mapping-profile';
import { batchToRows, type SpiRowBatch } from './spi-row-batch';
import { createSpiRowParser, parseSpiStream } from './spi-row-parser';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';
const T1 = '2026-03-02T08:00:00Z';
const T2 = '2026-03-02T08:00:20Z';
const row = (serial: string, time: string, refdes: string, extra = 'L1,PB-100,0') =>
	`${serial},${time},${extra},${refdes},1,100,100,120,0,0,pass`;

function run(text: string, profile: MappingProfile = CANONICAL_PROFILE, batchSize = 8192) {
	const parser = createSpiRowParser({ profile, fileName: 'memory.csv', batchSize });
	const batches: SpiRowBatch[] = [...parser.push(text), ...parser.end()];
	return {
		parser,
		batches,
		summary: parser.summary(),
		rows: batches.flatMap((b) => batchToRows(b, parser.boards()))
	};
}

describe('board grouping', () => {
	it('groups interleaved rows by serial + time', () => {
		const text = [
			HEADER,
			row('RB-A', T1, 'C1'),
			row('RB-B', T1, 'C1'),
			row('RB-A', T1, 'C2'),
			row('RB-A', T2, 'C1'), // same serial inspected again: a new board inspection
			row('RB-B', T1, 'C2')
		].join('\n');
		const { summary, rows } = run(text);
		expect(
			summary.boards.map((b) => [b.boardSerial, b.inspectedAtMs, b.aggregate.rows, b.firstLine])
		).toEqual([
			['RB-A', Date.UTC(2026, 2, 2, 8), 2, 2],
			['RB-B', Date.UTC(2026, 2, 2, 8), 2, 3],
			['RB-A', Date.UTC(2026, 2, 2, 8, 0, 20), 1, 5]
		]);
		expect(rows.map((r) => `${r.boardSerial}/${r.refdes}`)).toEqual([
			'RB-A/C1',
			'RB-B/C1',
			'RB-A/C2',
			'RB-A/C1',
			'RB-B/C2'
		]);
	});

	it('the same instant written with different offsets is one board', () => {
		const text = [
			HEADER,
			row('RB-A', '2026-03-02T09:00:00+01:00', 'C1'),
			row('RB-A', T1, 'C2')
		].join('\n');
		expect(run(text).summary.boards).toHaveLength(1);
	});

	it('rejects a row whose line or product disagrees with its board', () => {
		const text = [HEADER, row('RB-A', T1, 'C1'), row('RB-A', T1, 'C2', 'L2,PB-101,0')].join('\n');
		const { summary } = run(text);
		const of = 'than earlier rows of board RB-A inspected 2026-03-02T08:00:00.000Z';
		expect(summary.errors).toEqual([
			{ row: 3, column: 'line', message: `line "L2" differs from "L1" ${of}` },
			{ row: 3, column: 'product', message: `product "PB-101" differs from "PB-100" ${of}` }
		]);
	});
});

describe('batches', () => {
	it('emits full batches as it goes, and each board with the batch of its first row', () => {
		const lines = [HEADER];
		for (let i = 0; i < 5; i++) lines.push(row('RB-A', T1, `C${i}`));
		for (let i = 0; i < 2; i++) lines.push(row('RB-B', T1, `C${i}`));
		const parser = createSpiRowParser({
			profile: CANONICAL_PROFILE,
			fileName: 'x.csv',
			batchSize: 3
		});
		const during = parser.push(lines.join('\n') + '\n');
		const after = parser.end();
		expect(during.map((b) => b.length)).toEqual([3, 3]);
		expect(after.map((b) => b.length)).toEqual([1]);
		const all = [...during, ...after];
		expect(all.map((b) => b.newBoards.map((x) => x.boardSerial))).toEqual([['RB-A'], ['RB-B'], []]);
		expect(Array.from(all[1].boardIndex)).toEqual([0, 0, 1]);
		expect(all[0].line).toBeInstanceOf(Uint32Array);
		expect(all[0].line.length).toBe(3); // trimmed to the batch length
	});

	it('parseSpiStream drives a parser from an async iterable', async () => {
		async function* source() {
			yield `${HEADER}\n${row('RB-A', T1, 'C1')}\n`;
			yield new TextEncoder().encode(`${row('RB-A', T1, 'C2')}\n`);
		}
		const parser = createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'x.csv' });
		const lengths: number[] = [];
		for await (const batch of parseSpiStream(source(), parser)) lengths.push(batch.length);
		expect(lengths).toEqual([2]);
		expect(parser.summary().ok).toBe(true);
	});

	it('ignores pushes after end()', () => {
		const parser = createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'x.csv' });
		parser.push(`${HEADER}\n${row('RB-A', T1, 'C1')}\n`);
		parser.end();
		expect(parser.push(`${row('RB-A', T1, 'C2')}\n`)).toEqual([]);
		expect(parser.summary().rowsAccepted).toBe(1);
	});
});

describe('row checks', () => {
	it.each([
		[
			'blank lines are skipped, line numbers stay physical',
			`${HEADER}\n\n${row('RB-A', T1, 'C1')}\n   \n${row('RB-A', T1, 'bad')},x\n`,
			[{ row: 5, column: null, message: 'row has 14 fields, header has 13' }]
		],
		[
			'unterminated quote at end of file',
			`${HEADER}\n${row('RB-A', T1, 'C1')}\n"RB-A,${T1}`,
			[{ row: 3, column: null, message: 'unterminated quoted field at end of file' }]
		],
		[
			'text after a closing quote',
			`${HEADER}\n"RB-A"x,${T1},L1,PB-100,0,C1,1,100,100,120,0,0,pass`,
			[{ row: 2, column: null, message: 'text after closing quote in field 1' }]
		],
		[
			'over-long text',
			`${HEADER}\n${row('RB-A', T1, 'C'.repeat(101))}`,
			[{ row: 2, column: 'refdes', message: 'refdes is longer than 100 characters' }]
		],
		[
			'panel index too large',
			`${HEADER}\n${row('RB-A', T1, 'C1', 'L1,PB-100,65536')}`,
			[
				{
					row: 2,
					column: 'panel_index',
					message: 'panel_index must be an integer 0 to 65535: "65536"'
				}
			]
		],
		[
			'panel index not an integer',
			`${HEADER}\n${row('RB-A', T1, 'C1', 'L1,PB-100,1.5')}`,
			[
				{
					row: 2,
					column: 'panel_index',
					message: 'panel_index must be an integer 0 to 65535: "1.5"'
				}
			]
		],
		[
			'empty timestamp on the first row',
			`${HEADER}\n${row('RB-A', '', 'C1')}`,
			[
				{
					row: 2,
					column: 'inspected_at',
					message: 'inspected_at is not a timestamp in format iso: ""'
				}
			]
		],
		[
			'empty line code',
			`${HEADER}\n${row('RB-A', T1, 'C1', ',PB-100,0')}`,
			[{ row: 2, column: 'line', message: 'line is empty' }]
		]
	])('%s', (_name, text, errors) => {
		expect(run(text).summary.errors).toEqual(errors);
	});

	it.each([
		['0', 0],
		['1000', 1000],
		['0.00', 0]
	])('volume_pct boundary %s is accepted', (value, expected) => {
		const text = `${HEADER}\nRB-A,${T1},L1,PB-100,0,C1,1,${value},100,120,0,0,pass`;
		const { rows, summary } = run(text);
		expect(summary.errors).toEqual([]);
		expect(rows[0].volumePct).toBe(expected);
	});

	it('a quoted multi-line field longer than 50 lines is reported, not swallowed', () => {
		const lines = [HEADER, `"RB-A,${T1}`];
		for (let i = 0; i < 60; i++) lines.push('x');
		lines.push(row('RB-B', T1, 'C1'));
		const { summary } = run(lines.join('\n'), { ...CANONICAL_PROFILE, onBadRow: 'skip-row' });
		expect(summary.errors[0]).toEqual({
			row: 2,
			column: null,
			message: 'unterminated quoted field (field 1)'
		});
		expect(summary.rowsAccepted).toBe(1);
	});

	it('keeps the first 100 errors and counts all', () => {
		const lines = [HEADER];
		for (let i = 0; i < 250; i++) lines.push(`RB-A,${T1},L1,PB-100,0,C${i},1,x,100,120,0,0,pass`);
		const { summary } = run(lines.join('\n'));
		expect(summary.errorCount).toBe(250);
		expect(summary.errors).toHaveLength(100);
		expect(summary.errors[99].row).toBe(101);
		expect(summary.rowsRejected).toBe(250);
	});

	it('skip-row with no good row is a file-level error', () => {
		const { summary } = run(`${HEADER}\nRB-A,${T1},L1,PB-100,0,C1,1,x,100,120,0,0,pass`, {
			...CANONICAL_PROFILE,
			onBadRow: 'skip-row'
		});
		expect(summary.ok).toBe(false);
		expect(summary.errors[1]).toEqual({
			row: 0,
			column: null,
			message: 'no valid data rows (all 1 rejected)'
		});
	});

	it('reject-file stops handing out batches at the first bad row but reports later errors', () => {
		const lines = [
			HEADER,
			row('RB-A', T1, 'C1'),
			row('RB-A', T1, 'C2'),
			row('RB-A', T1, 'C3').replace('pass', '??'),
			row('RB-A', T1, 'C4'),
			row('RB-A', T1, 'C5').replace(',120,', ',-1,')
		];
		const { summary, batches } = run(lines.join('\n'), CANONICAL_PROFILE, 2);
		expect(batches.map((b) => b.length)).toEqual([2]); // handed out before the error; caller rolls back
		expect(summary.ok).toBe(false);
		expect(summary.errors.map((e) => [e.row, e.column])).toEqual([
			[4, 'result'],
			[6, 'height_um']
		]);
		expect(summary.boards).toEqual([]);
	});

	it('a duplicated column is a header error', () => {
		const { summary } = run(`${HEADER},refdes\n`);
		expect(summary.errors).toEqual([
			{ row: 1, column: 'refdes', message: 'column "refdes" appears more than once' }
		]);
	});

	it('a string chunk with U+FFFD (decoded with the wrong charset) is a file-level error', () => {
		const { summary } = run(`${HEADER}\n${row('RB-A', T1, 'C\uFFFD1')}\n`);
		expect(summary.errors).toEqual([
			{
				row: 0,
				column: null,
				message:
					'file is not valid UTF-8 text (replacement character U+FFFD on line 2); it was decoded with the wrong encoding'
			}
		]);
	});

	it('a multi-byte character split across byte chunks decodes correctly', () => {
		const bytes = new TextEncoder().encode(`${HEADER},stencil\n${row('RB-A', T1, 'C1')},Ø-7\n`);
		const cut = bytes.indexOf(0xc3); // first byte of Ø (C3 98)
		const parser = createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'x.csv' });
		parser.push(bytes.subarray(0, cut + 1));
		parser.push(bytes.subarray(cut + 1));
		parser.end();
		expect(parser.summary().boards[0].stencil).toBe('Ø-7');
	});
});

describe('profiles', () => {
	it('rejects a bad batch size', () => {
		expect(() =>
			createSpiRowParser({ profile: CANONICAL_PROFILE, fileName: 'x', batchSize: 0 })
		).toThrow('createSpiRowParser requires a positive integer batchSize, got 0');
	});

	it('rejects an unknown time zone at creation, not mid-file', () => {
		expect(() =>
			createSpiRowParser({
				profile: { ...CANONICAL_PROFILE, timeZone: 'Mars/Olympus' },
				fileName: 'x'
			})
		).toThrow('createSpiRowParser: unknown time zone "Mars/Olympus"');
	});

	it('uses constants for line, product and panel index when the export lacks them', () => {
		const text =
			'board_serial,inspected_at,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result\nRB-A,2026-03-02 09:00:00,C1,1,100,100,120,0,0,OK';
		const profile: MappingProfile = {
			...CANONICAL_PROFILE,
			timeZone: 'Europe/Berlin',
			resultWords: { pass: ['OK'], warn: [], fail: ['NG'] },
			constants: { line: 'L9', product: 'PB-300', panelIndex: 3 }
		};
		const { rows, summary } = run(text, profile);
		expect(summary.errors).toEqual([]);
		expect(rows[0]).toMatchObject({
			lineCode: 'L9',
			productCode: 'PB-300',
			panelIndex: 3,
			result: 0
		});
		expect(new Date(rows[0].inspectedAtMs).toISOString()).toBe('2026-03-02T08:00:00.000Z');
	});

	it('maps columns by profile names, case-insensitively', () => {
		const text =
			'SN;Time;Line;Prog;Arr;Ref;Pin;Vol;Area;H;DX;DY;Res\nRB-A;2026-03-02T08:00:00Z;L1;PB-100;0;C1;1;99,5;100;120;0;0;pass';
		const profile: MappingProfile = {
			...CANONICAL_PROFILE,
			decimalComma: true,
			columns: {
				board_serial: 'sn',
				inspected_at: 'time',
				line: 'LINE',
				product: 'prog',
				panel_index: 'arr',
				refdes: 'ref',
				pad: 'pin',
				volume_pct: 'vol',
				area_pct: 'area',
				height_um: 'h',
				offset_x_um: 'dx',
				offset_y_um: 'dy',
				result: 'res'
			}
		};
		const { rows, summary } = run(text, profile);
		expect(summary.delimiter).toBe(';');
		expect(rows[0].volumePct).toBe(99.5);
	});

	it('names the profile header in a missing-column error', () => {
		const { summary } = run(HEADER.replace('height_um', 'h'), {
			...CANONICAL_PROFILE,
			columns: { height_um: 'Height(um)' }
		});
		expect(summary.errors).toContainEqual({
			row: 1,
			column: 'Height(um)',
			message: 'required column "Height(um)" (for height_um) is missing'
		});
	});
});

describe('robustness', () => {
	it('never throws on mutated or random input (seeded, 300 cases)', () => {
		const good = [
			HEADER,
			row('RB-A', T1, 'C1'),
			row('RB-A', T1, 'C2'),
			row('RB-B', T2, '"C,3"')
		].join('\r\n');
		const alphabet = ',;\t"\r\n \uFEFF0123456789.-+eE:TZabc\u00e9\u00b5';
		let seed = 99;
		const next = (n: number) => {
			seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
			return seed % n;
		};
		for (let k = 0; k < 300; k++) {
			const chars = good.split('');
			for (let m = next(12); m >= 0; m--) {
				const at = next(chars.length);
				const op = next(3);
				if (op === 0) chars.splice(at, 1);
				else if (op === 1) chars.splice(at, 0, alphabet[next(alphabet.length)]);
				else chars[at] = alphabet[next(alphabet.length)];
			}
			const text = chars.join('');
			for (const profile of [
				CANONICAL_PROFILE,
				{ ...CANONICAL_PROFILE, onBadRow: 'skip-row' as const }
			]) {
				const parser = createSpiRowParser({ profile, fileName: 'fuzz.csv', batchSize: 2 });
				const bytes = new TextEncoder().encode(text);
				const step = 1 + next(17);
				let rows = 0;
				for (let i = 0; i < bytes.length; i += step) {
					for (const b of parser.push(bytes.subarray(i, i + step))) rows += b.length;
				}
				for (const b of parser.end()) rows += b.length;
				const s = parser.summary();
				// Every data row is accepted or rejected (unless reading stopped); ok ⇒ all handed out.
				if (s.errors.every((e) => e.row > 0) && s.rowsAccepted + s.rowsRejected !== s.dataRows) {
					throw new Error(`inconsistent counts for ${JSON.stringify(text)}: ${JSON.stringify(s)}`);
				}
				if (s.ok) expect(rows).toBe(s.rowsAccepted);
				expect(s.errors.length).toBeLessThanOrEqual(100);
			}
		}
	});

	it('reads bytes exactly as it reads the same text (byte path against text path, 600 cases)', () => {
		// Bytes take the byte path for plain ASCII rows; strings always take the text path, so the
		// text path is the oracle. Cells are replaced by values each path must judge alike.
		const cells = [
			'',
			' ',
			' 12',
			'12 ',
			'1e2',
			'+5',
			'-0',
			'-0.00',
			'0',
			'5000',
			'5000.01',
			'-5000.00',
			'99999',
			'1000',
			'1000.01',
			'.5',
			'5.',
			'-',
			'.',
			'abc',
			'12a',
			'1,5',
			'007',
			'65535',
			'65536',
			'123456',
			'1.2345678901234567',
			'pass',
			'PASS',
			'Pass',
			'pAss',
			'warn',
			'FAIL',
			'ok',
			'"q,x"',
			'Cé',
			'µ',
			'C 1',
			' C1',
			'C1 ',
			'x'.repeat(101),
			'x'.repeat(100),
			'2026-03-02T08:00:00Z',
			'2026-03-02T09:00:00+01:00',
			'2026-03-02 08:00:00',
			'2026-02-30T08:00:00Z',
			'RB-A',
			'RB-B',
			'L1',
			'L2',
			'PB-100',
			'SH-220',
			'1',
			'2',
			// Hostile numbers: each path must refuse them alike (Number() would take several).
			'0x10',
			'0b11',
			'0o17',
			'1e308',
			'1e400',
			'-1e2',
			'2.5E1',
			'Infinity',
			'NaN',
			'1_000',
			'+-1',
			'\uff11\uff12',
			'\u00a012',
			'12\t',
			'1.5',
			'.5e1',
			'1e1234',
			'0000-01-01T00:00:00Z',
			'1969-12-31T23:59:59Z',
			'2026-03-02T24:00:00Z',
			'2026-03-02T08:00:00+15:00',
			'\u00a02026-03-02T08:00:00Z',
			'2026-03-02T08:00:00.123456789Z',
			'\u00a0L1'
		];
		let seed = 4242;
		const next = (n: number) => {
			seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
			return seed % n;
		};
		const base = [row('RB-A', T1, 'C1'), row('RB-A', T1, 'C2'), row('RB-B', T2, 'C1')];
		const profiles: MappingProfile[] = [
			CANONICAL_PROFILE,
			{ ...CANONICAL_PROFILE, onBadRow: 'skip-row' },
			{ ...CANONICAL_PROFILE, onBadRow: 'skip-row', lengthUnit: 'mil' },
			{ ...CANONICAL_PROFILE, onBadRow: 'skip-row', delimiter: ';', decimalComma: true }
		];
		for (let k = 0; k < 600; k++) {
			const profile = profiles[k % profiles.length];
			const d = profile.delimiter === ';' ? ';' : ',';
			const lines = [HEADER.split(',').join(d)];
			for (let r = 0; r < 6; r++) {
				const fields = base[next(base.length)].split(',');
				for (let m = next(3); m > 0; m--) fields[next(fields.length)] = cells[next(cells.length)];
				if (next(20) === 0) fields.pop(); // a wrong field count now and then
				lines.push(fields.join(d));
			}
			const text = lines.join(next(2) === 0 ? '\n' : '\r\n') + (next(2) === 0 ? '\n' : '');
			const asText = run(text, profile, 3);
			const parser = createSpiRowParser({ profile, fileName: 'memory.csv', batchSize: 3 });
			const bytes = new TextEncoder().encode(text);
			const step = 1 + next(40);
			const batches: SpiRowBatch[] = [];
			for (let i = 0; i < bytes.length; i += step)
				batches.push(...parser.push(bytes.subarray(i, i + step)));
			batches.push(...parser.end());
			const context = `case ${k}: ${JSON.stringify(text)}`;
			expect(parser.summary(), context).toEqual(asText.summary);
			expect(
				batches.flatMap((b) => batchToRows(b, parser.boards())),
				context
			).toEqual(asText.rows);
		}
	});
});
