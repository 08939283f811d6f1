import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { scanFieldBounds, splitQuotedLine } from './split-delimited-line';

const cells = (line: string, d: string) => {
	const s = new Int32Array(32);
	const e = new Int32Array(32);
	const n = scanFieldBounds(line, d, s, e);
	return Array.from({ length: Math.min(n, 32) }, (_, i) => line.slice(s[i], e[i]));
};

describe('scanFieldBounds', () => {
	it.each([
		['a,b,c', ',', ['a', 'b', 'c']],
		['', ',', ['']],
		[',', ',', ['', '']],
		['a,,c,', ',', ['a', '', 'c', '']],
		['1;2,5;3', ';', ['1', '2,5', '3']],
		['x\ty', '\t', ['x', 'y']]
	])('%j split on %j', (line, d, expected) => {
		expect(cells(line, d)).toEqual(expected);
	});

	it('counts fields beyond the arrays without writing them', () => {
		const s = new Int32Array(2);
		const e = new Int32Array(2);
		expect(scanFieldBounds('a,b,c,d', ',', s, e)).toBe(4);
		expect(Array.from(e)).toEqual([1, 3]);
	});
});

describe('splitQuotedLine (RFC 4180 §2)', () => {
	// Cases from RFC 4180 §2 rules 5–7: quoted fields, delimiters and line breaks inside quotes,
	// doubled quotes. Each is also checked against papaparse, an independent RFC 4180 reader.
	it.each([
		['"a,b",c', ['a,b', 'c']],
		['"say ""hi""",x', ['say "hi"', 'x']],
		['"",x', ['', 'x']],
		['"line\nbreak",x', ['line\nbreak', 'x']],
		['a,"b",c', ['a', 'b', 'c']],
		['a,"b"', ['a', 'b']],
		['"a"', ['a']],
		['a,b"c,d', ['a', 'b"c', 'd']]
	])('%j', (line, expected) => {
		const result = splitQuotedLine(line, ',');
		expect(result).toEqual({ fields: expected, error: null, unterminated: false });
		expect(Papa.parse<string[]>(line, { delimiter: ',' }).data[0]).toEqual(expected);
	});

	it('tolerates blanks around a quoted field', () => {
		expect(splitQuotedLine(' "a" , b', ',').fields).toEqual(['a', ' b']);
	});

	it.each([
		['"open,C1', 'unterminated quoted field (field 1)', true],
		['a,"open', 'unterminated quoted field (field 2)', true],
		['"a"x,b', 'text after closing quote in field 1', false]
	])('%j → %s', (line, error, unterminated) => {
		expect(splitQuotedLine(line, ',')).toEqual({ fields: null, error, unterminated });
	});

	it('works with semicolons and tabs', () => {
		expect(splitQuotedLine('"1;5";2', ';').fields).toEqual(['1;5', '2']);
		expect(splitQuotedLine('"a\tb"\tc', '\t').fields).toEqual(['a\tb', 'c']);
	});
});
