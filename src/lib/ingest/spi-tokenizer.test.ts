import { describe, expect, it } from 'vitest';
import { createSpiTokenizer, firstInvalidUtf8Byte, type SpiTokenSink } from './spi-tokenizer';

type Event =
	| ['header', string[], string]
	| ['record', number, string[]]
	| ['bad', number, string]
	| ['file', number, string];

/** Tokenize `pieces` and list what the sink was told, cells cut out as strings. */
function tokenize(
	pieces: (string | Uint8Array)[],
	options: { delimiter?: ',' | ';' | '\t' | null; maxLineBytes?: number; maxColumns?: number } = {}
): Event[] {
	const events: Event[] = [];
	const sink: SpiTokenSink = {
		header: (names, d) => events.push(['header', names, d]),
		record(cells, row) {
			const out: string[] = [];
			for (let i = 0; i < Math.min(cells.count, cells.starts.length); i++)
				out.push(cells.text.slice(cells.starts[i], cells.ends[i]));
			events.push(['record', row, out]);
		},
		badRecord: (row, message) => events.push(['bad', row, message]),
		fileError(row, message) {
			events.push(['file', row, message]);
			tokenizer.stop();
		}
	};
	const tokenizer = createSpiTokenizer(
		{
			delimiter: options.delimiter ?? null,
			maxLineBytes: options.maxLineBytes ?? 1024,
			maxColumns: options.maxColumns ?? 10
		},
		sink
	);
	for (const p of pieces) tokenizer.push(p);
	tokenizer.end();
	return events;
}

const bytes = (text: string) => new TextEncoder().encode(text);
/** The bytes of `text` cut into pieces of `size` (multi-byte characters get split). */
const pieces = (text: string, size: number) => {
	const all = bytes(text);
	const out: Uint8Array[] = [];
	for (let i = 0; i < all.length; i += size) out.push(all.subarray(i, i + size));
	return out;
};

describe('createSpiTokenizer', () => {
	const file = '\ufeffa;b;c\r\n\r\n1;"x;\ny";µ\n  \n2;3;4';

	it('cuts text into a header and records: BOM, CR, blank lines, quotes across lines', () => {
		expect(tokenize([file])).toEqual([
			['header', ['a', 'b', 'c'], ';'],
			['record', 3, ['1', 'x;\ny', 'µ']],
			['record', 6, ['2', '3', '4']]
		]);
	});

	it('reads bytes in any cut exactly as the same text (one path)', () => {
		for (const size of [1, 2, 3, 5, 64])
			expect(tokenize(pieces(file, size))).toEqual(tokenize([file]));
	});

	it('reports more fields than the header as the true count', () => {
		const events = tokenize(['a,b\n1,2,3\n']);
		expect(events[1]).toEqual(['record', 2, ['1', '2', '3']]);
	});

	it('a bad quoted record is a bad row; an unterminated one at the end too', () => {
		expect(tokenize(['a,b\n"x"y,1\n"open,2\n'])).toEqual([
			['header', ['a', 'b'], ','],
			['bad', 2, 'text after closing quote in field 1'],
			['bad', 3, 'unterminated quoted field at end of file']
		]);
	});

	it('invalid UTF-8 names the byte, its file offset and line, after the lines before it', () => {
		const head = bytes('a,b\n1,2\n');
		const events = tokenize([head, new Uint8Array([0x33, 0x2c, 0xc3, 0x28, 0x0a])]);
		expect(events).toEqual([
			['header', ['a', 'b'], ','],
			['record', 2, ['1', '2']],
			[
				'file',
				0,
				`file is not valid UTF-8 text (byte 0xC3 at byte ${head.length + 2}, line 3); save or export it as UTF-8`
			]
		]);
	});

	it('a file ending inside a multi-byte character is refused', () => {
		expect(tokenize([bytes('a,b\n1,'), new Uint8Array([0xe2, 0x82])]).at(-1)).toEqual([
			'file',
			0,
			'file is not valid UTF-8 text (it ends inside a multi-byte character)'
		]);
	});

	it('budgets a line of bytes in bytes and a line of text in UTF-16 units', () => {
		const line = 'a,' + 'é'.repeat(40); // 42 units, 82 bytes
		const limit = { maxLineBytes: 60 };
		expect(tokenize([bytes(line + '\n')], limit)[0]).toEqual([
			'file',
			1,
			'line 1 is longer than the limit of 60 bytes (SPI_MAX_LINE_BYTES); is this a text export with line breaks?'
		]);
		expect(tokenize([line + '\n'], limit)[0][0]).toBe('header');
	});

	it('refuses a header over the column budget before splitting it', () => {
		expect(tokenize(['a,b,c,d\n'], { maxColumns: 3 })).toEqual([
			['file', 1, 'header has 4 columns, more than the limit of 3 (SPI_MAX_COLUMNS)']
		]);
	});

	it('refuses NUL bytes and replacement characters with their line', () => {
		expect(tokenize([bytes('a,b\n1,2\n'), new Uint8Array([0x31, 0x00])])).toEqual([
			['header', ['a', 'b'], ','],
			['record', 2, ['1', '2']],
			['file', 0, 'file is not text: NUL byte at byte 9 (line 3); is it a binary export?']
		]);
		expect(tokenize(['a,b\n\ufffd'])).toEqual([
			[
				'file',
				0,
				'file is not valid UTF-8 text (replacement character U+FFFD on line 2); it was decoded with the wrong encoding'
			]
		]);
	});
});

describe('firstInvalidUtf8Byte', () => {
	it.each([
		[[0x41, 0x42], -1],
		[[0x41, 0xff], 1],
		[[0xc0, 0x80], 0], // overlong
		[[0xed, 0xa0, 0x80], 0], // surrogate
		[[0xf4, 0x90, 0x80, 0x80], 0], // past U+10FFFF
		[[0x41, 0xe2, 0x82], -1] // cut off at the end
	])('%j → %i', (input, expected) => {
		expect(firstInvalidUtf8Byte(new Uint8Array(input))).toBe(expected);
	});
});
