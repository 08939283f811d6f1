import { describe, expect, it } from 'vitest';
import { parseDecimal, parseDecimalBytes } from './parse-decimal';

describe('parseDecimal', () => {
	// The fast path must agree with Number(), the ECMAScript StringToNumber reference, bit for bit.
	it.each([
		'0',
		'-0',
		'1',
		'101.25',
		'-12.5',
		'0.1',
		'0.3',
		'.5',
		'5.',
		'123456789012345',
		'1234567890.12345',
		'0.000000000000000000001',
		'99.99',
		'1.15',
		'1e3',
		' 42 ',
		'+7',
		'12345678901234567890'
	])('%j equals Number()', (text) => {
		expect(Object.is(parseDecimal(text, false), Number(text))).toBe(true);
	});

	it('agrees with Number() on 20 000 random 2-decimal values', () => {
		// Deterministic LCG (Numerical Recipes constants) so a failure is reproducible.
		let seed = 12345;
		const mismatches: string[] = [];
		for (let i = 0; i < 20000; i++) {
			seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
			const text = ((seed / 2 ** 32) * 4000 - 2000).toFixed(i % 4);
			if (parseDecimal(text, false) !== Number(text)) mismatches.push(text);
		}
		expect(mismatches).toEqual([]);
	});

	it.each([
		['101,25', 101.25],
		['-0,5', -0.5],
		[',5', 0.5],
		['+1,5e2', 150],
		['1234567890123456,5', 1234567890123456.5]
	])('decimal comma %j → %d', (text, expected) => {
		expect(parseDecimal(text, true)).toBe(expected);
	});

	it.each([
		'0x10',
		'0X10',
		'0b11',
		'0o17',
		'1e308x',
		'1e1000',
		'1e400',
		'-1e400',
		'Infinity',
		'+Infinity',
		'NaN',
		'1_000',
		'+-1',
		'-+1',
		'--1',
		'++1',
		'\uff11\uff12', // full-width digits １２
		'\u0661\u0662', // Arabic-Indic digits
		'\t12',
		'12\t',
		'\u00a012',
		'12\u00a0',
		'\u200b12',
		'1 2',
		'- 1',
		'1e',
		'1e+',
		'e5',
		'1e5.5',
		'1e1234',
		'1.2e3.4',
		'.e1',
		'1,000'
	])('%j is refused (not plain decimal notation)', (text) => {
		expect(parseDecimal(text, false)).toBeNaN();
	});

	it.each([
		[' 12', 12],
		['12 ', 12],
		['+12', 12],
		['1e308', 1e308],
		['-2.5E-3', -0.0025],
		['5.e1', 50],
		['.5', 0.5]
	])('%j is plain decimal notation → %d', (text, expected) => {
		expect(parseDecimal(text, false)).toBe(expected);
	});

	// With a decimal comma the point is a thousands separator in such exports: refused, never
	// read as a decimal mark (1.234 would be 1000x too small).
	it.each(['3.5', '1.234', '0x10', '1_0', '\uff11'])(
		'%j is refused with a decimal comma',
		(text) => {
			expect(parseDecimal(text, true)).toBeNaN();
		}
	);

	it.each([
		'',
		'   ',
		'-',
		'.',
		'abc',
		'1,5',
		'1.2.3',
		'Infinity',
		'-Infinity',
		'NaN',
		'1e400',
		'12a'
	])('%j is NaN (decimal point)', (text) => {
		expect(parseDecimal(text, false)).toBeNaN();
	});

	it.each(['1.234,5', '1,2,3', ','])('%j is NaN (decimal comma)', (text) => {
		expect(parseDecimal(text, true)).toBeNaN();
	});

	it('reads a range of a longer string in place', () => {
		expect(parseDecimal('a,101.5,b', false, 2, 7)).toBe(101.5);
		expect(parseDecimal('a,,b', false, 2, 2)).toBeNaN();
	});
});

describe('parseDecimalBytes', () => {
	const bytes = (text: string) => new TextEncoder().encode(text);
	const read = (text: string, decimalComma = false) =>
		parseDecimalBytes(bytes(text), decimalComma, 0, bytes(text).length);

	// Plain forms: the same double as Number() (the ECMAScript reference), bit for bit.
	it.each(['0', '-0', '1', '101.25', '-12.5', '0.1', '.5', '5.', '123456789012345', '99.99'])(
		'%j equals Number()',
		(text) => {
			expect(Object.is(read(text), Number(text))).toBe(true);
		}
	);

	it('agrees with parseDecimal on 20 000 random values with 0–3 decimals', () => {
		let seed = 987654321;
		const mismatches: string[] = [];
		for (let i = 0; i < 20000; i++) {
			seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
			const text = ((seed / 2 ** 32) * 4000 - 2000).toFixed(i % 4);
			if (!Object.is(read(text), parseDecimal(text, false))) mismatches.push(text);
		}
		expect(mismatches).toEqual([]);
	});

	it('reads the decimal comma and a range of a longer buffer', () => {
		expect(read('101,25', true)).toBe(101.25);
		expect(read('101.25', true)).toBeNaN(); // the point is no decimal mark then
		expect(parseDecimalBytes(bytes('a;-0,5;b'), true, 2, 6)).toBe(-0.5);
	});

	// Forms that the text path handles (or rejects) give NaN here.
	it.each([
		'',
		'-',
		'.',
		' 42',
		'+7',
		'1e3',
		'12a',
		'1.2.3',
		'1,5',
		'12345678901234567890',
		'0x10',
		'1_0'
	])('%j is NaN (left to the text path)', (text) => {
		expect(read(text)).toBeNaN();
	});
});
