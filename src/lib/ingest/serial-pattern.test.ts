import { describe, expect, it } from 'vitest';
import { CANONICAL_PROFILE } from './mapping-profile';
import { compileSerialPattern, serialFromText } from './serial-pattern';
import { createSpiRowParser } from './spi-row-parser';

const compiled = (pattern: string) => {
	const check = compileSerialPattern(pattern);
	if (!check.ok) throw new Error(check.reason);
	return check.regex;
};

describe('compileSerialPattern / serialFromText', () => {
	it('takes the capture group of the first match, trimmed', () => {
		expect(serialFromText(compiled('^(RB-\\d+)_'), 'RB-17_top.csv')).toBe('RB-17');
		expect(serialFromText(compiled('^(?:SPI_)?(RB-\\d+)\\.csv$'), 'SPI_RB-9.csv')).toBe('RB-9');
		expect(serialFromText(compiled('_( *\\w+ *)\\.'), 'x_ RB7 .csv')).toBe('RB7');
	});

	it('gives null when nothing matches or the group is empty', () => {
		expect(serialFromText(compiled('^(RB-\\d+)_'), 'board.csv')).toBeNull();
		expect(serialFromText(compiled('^(\\d*)'), 'board.csv')).toBeNull();
	});

	// The classic catastrophic-backtracking pattern: JavaScript's RegExp needs about 2^n steps for
	// n characters before it gives up on the final '!'; RE2 answers in one linear pass.
	it('(a+)+$ against a 100,000-character text that ends in a non-match answers', () => {
		const regex = compiled('(a+)+$');
		expect(serialFromText(regex, 'a'.repeat(100_000) + '!')).toBeNull();
		expect(serialFromText(regex, 'a'.repeat(100_000))).toBe('a'.repeat(100_000));
	});

	it('the parser refuses a file whose 100,000-character name defeats (a+)+$, without stalling', () => {
		const parser = createSpiRowParser({
			profile: { ...CANONICAL_PROFILE, serialFromFileName: { pattern: '(a+)+$' } },
			fileName: 'a'.repeat(100_000) + '!'
		});
		parser.end();
		expect(parser.summary().errors[0]).toEqual({
			row: 0,
			column: null,
			message: `file name "${'a'.repeat(100_000)}!" does not match the serial pattern /(a+)+$/`
		});
	});

	it('a pattern saved before patterns ran on RE2 is a file-level error, not a crash', () => {
		const parser = createSpiRowParser({
			profile: { ...CANONICAL_PROFILE, serialFromFileName: { pattern: '^(RB-\\d+)(?=_)' } },
			fileName: 'RB-1_top.csv'
		});
		parser.end();
		expect(parser.summary().errors[0]).toEqual({
			row: 0,
			column: null,
			message:
				"the profile's serial pattern is not valid RE2 syntax: invalid or unsupported Perl syntax: `(?=` (back-references and look-around are not supported); edit the mapping profile"
		});
		expect(parser.summary().ok).toBe(false);
	});

	it('a serial from the file name longer than 100 characters is refused', () => {
		const parser = createSpiRowParser({
			profile: { ...CANONICAL_PROFILE, serialFromFileName: { pattern: '^(\\w+)' } },
			fileName: 'R'.repeat(101) + '.csv'
		});
		parser.end();
		expect(parser.summary().errors[0]?.message).toBe(
			'board_serial from the file name is longer than 100 characters'
		);
	});

	it.each([
		['(a)\\1', 'invalid escape sequence: `\\1`'],
		['(?!x)(a)', 'invalid or unsupported Perl syntax: `(?!`'],
		['(?<=x)(a)', 'invalid named capture: `(?<=x)(a)`']
	])('refuses %j: %s', (pattern, detail) => {
		expect(compileSerialPattern(pattern)).toEqual({
			ok: false,
			reason: `serial pattern is not valid RE2 syntax: ${detail} (back-references and look-around are not supported)`
		});
	});
});
