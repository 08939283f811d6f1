import { describe, it, expect } from 'vitest';
import { checkGerberText } from './gerber-text-check';

describe('checkGerberText', () => {
	const cases: [string, unknown, number, { line: number; message: RegExp } | null][] = [
		['a good file', '%FSLAX26Y26*%\n%MOMM*%\nM02*\n', 1e6, null],
		['tabs, CR and LF are text', 'G04 a*\r\n\tM02*\r\n', 1e6, null],
		['a UTF-8 comment is text', 'G04 Größe µm*\nM02*\n', 1e6, null],
		['a number', 42, 1e6, { line: 0, message: /^file, input: must be text \(got number\)$/ }],
		['undefined', undefined, 1e6, { line: 0, message: /got undefined/ }],
		['empty', '', 1e6, { line: 0, message: /^file, content: the file is empty$/ }],
		['blank', '\n \n', 1e6, { line: 0, message: /empty/ }],
		['exactly at the limit', 'M02*', 4, null],
		['one over the limit', 'M02*\n', 4, { line: 0, message: /^file, size: / }],
		[
			'a NUL on line 2, column 4',
			'G04*\nX12\u0000',
			1e6,
			{ line: 2, message: /^line 2, column 4: binary data \(U\+0000\)/ }
		],
		['DEL', 'M02*\u007F', 1e6, { line: 1, message: /U\+007F/ }],
		['no * at all', 'hello\nworld\n', 1e6, { line: 1, message: /not a Gerber file/ }]
	];
	for (const [name, text, max, want] of cases) {
		it(name, () => {
			const got = checkGerberText(text, max);
			if (want === null) expect(got).toBeNull();
			else {
				expect(got?.line).toBe(want.line);
				expect(got?.message).toMatch(want.message);
			}
		});
	}
});
