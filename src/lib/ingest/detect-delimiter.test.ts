import { describe, expect, it } from 'vitest';
import { detectDelimiter } from './detect-delimiter';
import { previewSample } from './preview-sample';

describe('detectDelimiter', () => {
	it.each([
		['comma', 'a,b,c\n1,2,3\n4,5,6', ','],
		[
			'semicolon with decimal commas',
			'serial;volume;height\nRB-1;101,5;0,12\nRB-2;99,25;0,13',
			';'
		],
		['semicolon, decimal commas in every row and none in the header', 'a;b\n1,5;2,5\n3,5;4,5', ';'],
		['tab', 'a\tb\tc\n1\t2\t3', '\t'],
		['tab with decimal commas', 'a\tb\n1,5\t2', '\t'],
		['quoted commas do not count', 'a;b\n"x,y,z";1\n"p,q";2', ';'],
		['CRLF and BOM', '\uFEFFa,b\r\n1,2\r\n', ','],
		['header only', 'a;b;c', ';'],
		['single column falls back to comma', 'serial\nRB-1', ','],
		['empty', '', ','],
		['cut-off last line does not vote', 'a,b,c\n1,2,3\n4,5', ',']
	])('%s', (_name, text, expected) => {
		expect(detectDelimiter(text)).toBe(expected);
	});
});

describe('previewSample', () => {
	it('returns header and first rows, trimmed header, detected decimal comma', () => {
		const text = '\uFEFF Barcode ;Volume(%)\r\nRB-1;101,5\r\nRB-2;99,0\r\nRB-3;98,';
		expect(previewSample(text, 5)).toEqual({
			delimiter: ';',
			decimalCommaLikely: true,
			header: ['Barcode', 'Volume(%)'],
			rows: [
				['RB-1', '101,5'],
				['RB-2', '99,0']
			]
		});
	});

	it.each([
		['n = 0', 'a,b\n1,2\n', 0, []],
		['n = 1', 'a,b\n1,2\n3,4\n', 1, [['1', '2']]],
		['fewer rows than n', 'a,b\n1,2\n', 10, [['1', '2']]],
		['quoted', 'a,b\n"x,y",2\n', 10, [['x,y', '2']]]
	])('%s', (_name, text, n, rows) => {
		expect(previewSample(text, n).rows).toEqual(rows);
	});

	it('empty text gives an empty preview', () => {
		expect(previewSample('', 5)).toEqual({
			delimiter: ',',
			decimalCommaLikely: false,
			header: [],
			rows: []
		});
	});

	it('comma files never claim a decimal comma', () => {
		expect(previewSample('a,b\n"1,5",2\n', 5).decimalCommaLikely).toBe(false);
	});

	it('rejects a bad row count', () => {
		expect(() => previewSample('a', -1)).toThrow(
			'previewSample requires a non-negative integer row count, got -1'
		);
	});
});
