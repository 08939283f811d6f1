import { describe, expect, it } from 'vitest';
import { match } from './id';

describe('id param matcher', () => {
	it('accepts positive whole numbers within the safe integer range', () => {
		for (const id of ['1', '42', '999999999999999']) expect(match(id)).toBe(true);
		expect(Number.isSafeInteger(Number('999999999999999'))).toBe(true);
	});
	it('refuses zero, signs, decimals, exponents, padding, words and overlong numbers', () => {
		for (const id of [
			'',
			'0',
			'007',
			'-1',
			'+1',
			'1.0',
			'1e3',
			' 1',
			'1 ',
			'abc',
			'0x10',
			'1234567890123456'
		])
			expect(match(id)).toBe(false);
	});
});
