import { describe, expect, it } from 'vitest';
import ref from '../../../reference/printlog/check-values.json';
import {
	boardSerialProblem,
	MAX_BOARD_SERIAL_LENGTH,
	normaliseBoardSerial,
	parseBoardSerial
} from './board-serial';

const { firstCodePoint, lastCodePoint, controlCodePoints, groupSeparator } = ref.printableAscii;

describe('normaliseBoardSerial', () => {
	// AIM identifiers (ISO/IEC 15424, reference/printlog/check-values.json): ]C1, ]d2, ]Q1.
	const cases: [string, string][] = [
		['FW-PB100-000123', 'FW-PB100-000123'],
		[']C1FW-PB100-000123\r', 'FW-PB100-000123'],
		[']d2fw-sh220-42\r\n', 'fw-sh220-42'],
		['  ]Q1 FW 77 \t', 'FW 77'],
		[String.fromCodePoint(groupSeparator) + 'FW-1' + String.fromCodePoint(groupSeparator), 'FW-1'],
		['FW-1]C1', 'FW-1]C1'],
		['', '']
	];
	it.each(cases)('%j → %j (case kept)', (raw, expected) => {
		expect(normaliseBoardSerial(raw)).toBe(expected);
	});
});

describe('boardSerialProblem', () => {
	it('accepts every printable ASCII character (ISO/IEC 646: U+0020–U+007E) inside a serial', () => {
		const all = Array.from({ length: lastCodePoint - firstCodePoint + 1 }, (_, i) =>
			String.fromCodePoint(firstCodePoint + i)
		).join('');
		expect(all).toHaveLength(95);
		expect(boardSerialProblem(`A${all}Z`)).toBeNull();
	});

	it('refuses each C0 control character and DEL, naming the code point and position', () => {
		const [lo, hi] = controlCodePoints.C0;
		for (const cp of [lo, groupSeparator, hi, controlCodePoints.DEL]) {
			const hex = cp.toString(16).toUpperCase().padStart(4, '0');
			expect(boardSerialProblem(`FW${String.fromCodePoint(cp)}1`)).toBe(
				`must contain only printable characters: U+${hex} at position 3 is not`
			);
		}
	});

	it('refuses characters outside ASCII (just past U+007E and beyond the BMP)', () => {
		expect(boardSerialProblem('FW-\u00801')).toMatch(/U\+0080 at position 4/);
		expect(boardSerialProblem('FW-µ1')).toMatch(/U\+00B5 at position 4/);
		expect(boardSerialProblem('😀FW')).toMatch(/U\+1F600 at position 1/);
	});

	it(`allows ${ref.boardSerialMaxLength.value} characters, the SPI board_serial limit, and no more`, () => {
		expect(MAX_BOARD_SERIAL_LENGTH).toBe(ref.boardSerialMaxLength.value);
		expect(boardSerialProblem('9'.repeat(ref.boardSerialMaxLength.value))).toBeNull();
		expect(boardSerialProblem('9'.repeat(ref.boardSerialMaxLength.value + 1))).toBe(
			`must be at most ${ref.boardSerialMaxLength.value} characters (got ${ref.boardSerialMaxLength.value + 1})`
		);
	});

	it('refuses blank and non-text values', () => {
		expect(boardSerialProblem('   ')).toBe('must not be blank');
		expect(boardSerialProblem(42 as unknown as string)).toBe('must be text (got 42)');
	});
});

describe('parseBoardSerial', () => {
	it('treats absent and blank as not given', () => {
		expect(parseBoardSerial(undefined)).toEqual({ value: null, error: null });
		expect(parseBoardSerial(null)).toEqual({ value: null, error: null });
		expect(parseBoardSerial(' \r\n')).toEqual({ value: null, error: null });
	});

	it('cleans a scan and returns the serial', () => {
		expect(parseBoardSerial(' ]C1FW-PB100-000123\r')).toEqual({
			value: 'FW-PB100-000123',
			error: null
		});
	});

	it('names the field of a bad serial', () => {
		expect(parseBoardSerial('FW\u00071', 'board')).toEqual({
			value: null,
			error: {
				field: 'board',
				message: 'must contain only printable characters: U+0007 at position 3 is not'
			}
		});
	});
});
