import { describe, it, expect } from 'vitest';
import { analyzeStudy, parseAnalyzeBody } from './analyze';

function errors(input: unknown) {
	const out = analyzeStudy(input);
	if (out.ok) throw new Error('expected errors');
	return out.errors;
}

// The "Bad input" list of the SPC issue, once more, for every chart the API accepts.
describe('analyzeStudy: every bad input gets a field and a reason, never NaN', () => {
	const sameSpread = (m: number) => [m - 1, m, m + 1, m];
	it.each([
		['NaN as text', { chart: 'i-mr', values: [1, 'NaN', 3] }, 'values[1]', /got text "NaN"/],
		[
			'NaN from a script',
			{ chart: 'i-mr', values: [1, NaN, 3] },
			'values[1]',
			/finite number, got NaN/
		],
		[
			'1e999 parses to Infinity',
			JSON.parse('{"chart":"xbar-s","subgroups":[[1,2],[3,1e999]]}'),
			'subgroups[1][1]',
			/finite number, got Infinity/
		],
		[
			'text as a spec limit',
			{ chart: 'i-mr', values: [1, 2, 3], usl: 'high' },
			'usl',
			/got text "high"/
		],
		[
			'a subgroup that is not an array',
			{ chart: 'xbar-r', subgroups: [[1, 2], 3] },
			'subgroups[1]',
			/expected an array of numbers/
		],
		['no subgroups at all', { chart: 'xbar-s', subgroups: [] }, 'subgroups', /is empty/],
		[
			'empty subgroups',
			{ chart: 'xbar-r', subgroups: [[], []] },
			'subgroups[0]',
			/size 0 is below 2/
		],
		[
			'LSL equal to USL',
			{ chart: 'i-mr', values: [1, 2, 3], lsl: 4, usl: 4 },
			'lsl',
			/LSL 4 must be below USL 4/
		],
		[
			'zero variation (X-bar/S)',
			{
				chart: 'xbar-s',
				subgroups: [
					[5, 5, 5],
					[6, 6, 6]
				]
			},
			'subgroups',
			/zero variation: every subgroup standard deviation is 0/
		],
		[
			'mixed sizes, first subgroup short',
			{ chart: 'xbar-r', subgroups: [[1], [2, 3], [4, 5]] },
			'subgroups[1]',
			/has 2 values but subgroup 0 has 1; X-bar\/R needs equal subgroup sizes/
		],
		[
			'between/within: size 1',
			{ chart: 'between-within', subgroups: [[1], [2], [3]] },
			'subgroups[0]',
			/size 1 is below 2 for between\/within; use chart 'i-mr'/
		],
		[
			'between/within: mixed sizes',
			{ chart: 'between-within', subgroups: [sameSpread(1), sameSpread(2), [1, 2, 3]] },
			'subgroups[2]',
			/has 3 values but subgroup 0 has 4; between\/within needs equal subgroup sizes/
		],
		[
			'between/within: one board',
			{ chart: 'between-within', subgroups: [sameSpread(1)] },
			'subgroups',
			/at least 2 subgroups for between\/within, got 1/
		],
		[
			'between/within: values only',
			{ chart: 'between-within', values: [1, 2, 3] },
			'subgroups',
			/is required for chart 'between-within'/
		],
		[
			'between/within: no spread within',
			{
				chart: 'between-within',
				subgroups: [
					[1, 1],
					[2, 2],
					[4, 4]
				]
			},
			'subgroups',
			/zero variation: every subgroup range is 0/
		],
		[
			'between/within: every mean the same',
			{ chart: 'between-within', subgroups: [sameSpread(3), sameSpread(3), sameSpread(3)] },
			'subgroups',
			/every subgroup mean is the same/
		]
	])('%s', (_label, input, field, message) => {
		const errs = errors(input);
		const hit = errs.find((e) => e.field === field);
		expect(hit, JSON.stringify(errs)).toBeDefined();
		expect(hit?.message).toMatch(message);
	});

	it('mixed sizes name the first subgroup that differs, not a later one', () => {
		const errs = errors({
			chart: 'xbar-s',
			subgroups: [
				[1, 2, 3],
				[2, 3, 4],
				[1, 2],
				[5, 6]
			]
		});
		expect(errs).toEqual([
			{
				field: 'subgroups[2]',
				message: 'has 2 values but subgroup 0 has 3; X-bar/S needs equal subgroup sizes'
			}
		]);
	});
});

describe('parseAnalyzeBody: a body that is not JSON says where', () => {
	it('accepts JSON', () => {
		expect(parseAnalyzeBody('{"chart":"i-mr","values":[1,2]}')).toEqual({
			ok: true,
			value: { chart: 'i-mr', values: [1, 2] }
		});
	});
	it.each([
		[
			'a bare NaN',
			'{"chart":"i-mr","values":[1,NaN,3]}',
			/NaN at character 29 is not a JSON number/
		],
		['Infinity', '{"values":[-Infinity]}', /Infinity at character 12 is not a JSON number/],
		['a decimal comma', '{"values":[1,5,2,5', /not valid JSON/],
		['an empty body', '', /body is empty/]
	])('%s', (_label, text, message) => {
		const out = parseAnalyzeBody(text);
		expect(out.ok).toBe(false);
		if (!out.ok) expect(out.error).toMatch(message);
	});
});
