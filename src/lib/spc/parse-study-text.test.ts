import { describe, expect, it } from 'vitest';
import { parseStudyText } from './parse-study-text';

describe('parseStudyText', () => {
	it.each([
		[
			'1 2 3\n4 5 6',
			[
				[1, 2, 3],
				[4, 5, 6]
			]
		],
		['1,2;3\t4', [[1, 2, 3, 4]]],
		['\n 1.5 \n\n-2e1\n', [[1.5], [-20]]],
		['a b\n1 2', [[1, 2]]],
		['x1;x2\r\n.5;+3', [[0.5, 3]]]
	])('%j → rows', (text, rows) => {
		const out = parseStudyText(text);
		expect(out).toMatchObject({ ok: true, rows });
	});

	it.each([
		['', 'no numbers found'],
		['   \n\n', 'no numbers found'],
		['1 2\n3 x', 'line 2, column 2: "x" is not a number'],
		['1 NaN', 'line 1, column 2: "NaN" is not a number'],
		['1 Infinity', 'line 1, column 2'],
		['1\n1e999', 'line 2, column 1']
	])('%j is refused with where', (text, message) => {
		const out = parseStudyText(text);
		expect(out.ok).toBe(false);
		if (!out.ok) expect(out.errors[0].message).toContain(message);
	});

	it('only skips a header on the first non-empty line', () => {
		const out = parseStudyText('1 2\nA B');
		expect(out.ok).toBe(false);
	});
});
