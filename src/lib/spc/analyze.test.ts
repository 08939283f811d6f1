import { describe, it, expect } from 'vitest';
import ref from '../../../reference/spc/worked-examples.json';
import { analyzeStudy, type AnalyzeResult } from './analyze';
import { chartConstants } from './chart-constants';
import { RULE_IDS } from './run-rules';

const nist = ref.nistIndividualsFlowRate;

function ok(input: unknown): AnalyzeResult {
	const out = analyzeStudy(input);
	if (!out.ok) throw new Error(JSON.stringify(out.errors));
	return out.result;
}
function errors(input: unknown) {
	const out = analyzeStudy(input);
	if (out.ok) throw new Error('expected errors');
	return out.errors;
}

describe('analyzeStudy: response shape and values', () => {
	it('I-MR on the NIST flow-rate data: limits, capability and no violations', () => {
		const r = ok({ chart: 'i-mr', values: nist.values, lsl: 40, usl: 60 });
		expect(Object.keys(r).sort()).toEqual(['assessment', 'capability', 'limits', 'violations']);
		// In control (NIST): a verdict is given, on the lower bound of Cpk.
		expect(r.assessment.stable).toBe(true);
		expect(r.assessment.basis?.index).toBe('Cpk');
		expect(r.capability.level).toBe(r.assessment.verdict);
		expect(r.capability.ppmObserved).toBe(0);
		expect(r.limits.location.cl).toBeCloseTo(nist.mean, 12);
		expect(r.limits.dispersion.lcl).toBe(0);
		expect(Math.abs(r.limits.location.ucl - nist.ucl)).toBeLessThan(0.002);
		const c = r.capability;
		expect(c.sigmaWithin).toBeCloseTo(r.limits.dispersion.cl / chartConstants(2).d2, 12);
		expect(c.cp).toBeCloseTo(20 / (6 * (c.sigmaWithin as number)), 12);
		expect(c.cpk).toBeCloseTo((60 - nist.mean) / (3 * (c.sigmaWithin as number)), 12);
		expect(c.cpkLower95).toBeLessThan(c.cpk as number);
		expect(r.violations).toEqual([]);
		// round-trips through JSON unchanged (no NaN/Infinity, which JSON cannot carry)
		expect(JSON.parse(JSON.stringify(r))).toEqual(r);
	});
	it('X-bar/R: a shifted subgroup is reported with its 0-based index', () => {
		const subgroups = Array.from({ length: 20 }, (_, i) => [
			10 + (i % 3) * 0.1,
			10.3,
			9.9 + (i % 2) * 0.2
		]);
		subgroups[12] = [14, 14.3, 13.9];
		const r = ok({ chart: 'xbar-r', subgroups, rules: ['we-1'] });
		expect(r.violations).toContainEqual({
			rule: 'we-1',
			chart: 'location',
			index: 12,
			points: [12]
		});
		expect(r.capability.cp).toBeNull();
		expect(r.capability.notes.join(' ')).toMatch(/No specification limits/);
	});
	it('X-bar/S with a one-sided spec and a Nelson rule set', () => {
		const subgroups = Array.from({ length: 10 }, (_, i) => [1, 2, 3, 4].map((v) => v + i * 0.5));
		const r = ok({ chart: 'xbar-s', subgroups, usl: 20, rules: ['nelson-3'] });
		expect(r.capability.cp).toBeNull();
		expect(r.capability.cpk).not.toBeNull();
		// means rise steadily: nelson-3 fires from the 6th subgroup on
		expect(r.violations.map((v) => v.index)).toEqual([5, 6, 7, 8, 9]);
		expect(r.violations.every((v) => v.rule === 'nelson-3' && v.chart === 'location')).toBe(true);
		// Rules flag points: no capability verdict, whatever Cpk says.
		expect(r.assessment.verdict).toBe('not-stable');
		expect(r.capability.level).toBe('not-stable');
		expect(r.capability.reading).toMatch(/^Not stable, capability not assessed\./);
	});
	it('I-MR also accepts single-value subgroups', () => {
		const r = ok({ chart: 'i-mr', subgroups: nist.values.map((v) => [v]) });
		expect(r.limits.location.cl).toBeCloseTo(nist.mean, 12);
	});
});

describe('analyzeStudy: bad input gives field errors (HTTP 422)', () => {
	it.each([
		['not an object', null, 'body', /expected a JSON object/],
		[
			'unknown chart',
			{ chart: 'p', values: [1, 2] },
			'chart',
			/must be one of: xbar-r, xbar-s, i-mr/
		],
		[
			'text in a subgroup',
			{
				chart: 'xbar-r',
				subgroups: [
					[1, 2],
					[3, 'x']
				]
			},
			'subgroups[1][1]',
			/got text "x"/
		],
		['null value', { chart: 'i-mr', values: [1, null, 3] }, 'values[1]', /got null/],
		[
			'unknown rule',
			{ chart: 'i-mr', values: [1, 2], rules: ['we-9'] },
			'rules[0]',
			/must be one of/
		],
		[
			'subgroup size 1',
			{ chart: 'xbar-r', subgroups: [[1], [2]] },
			'subgroups[0]',
			/size 1 is below 2.*i-mr/
		],
		[
			'mixed sizes (X-bar/R)',
			{ chart: 'xbar-r', subgroups: [[1, 2], [3, 4], [5]] },
			'subgroups[2]',
			/has 1 values but subgroup 0 has 2/
		],
		[
			'mixed sizes (X-bar/S)',
			{
				chart: 'xbar-s',
				subgroups: [
					[1, 2, 3],
					[3, 4]
				]
			},
			'subgroups[1]',
			/X-bar\/S needs equal/
		],
		[
			'n > 10 on X-bar/R',
			{ chart: 'xbar-r', subgroups: [new Array(12).fill(1), new Array(12).fill(2)] },
			'subgroups[0]',
			/use chart 'xbar-s'/
		],
		['too few values', { chart: 'i-mr', values: [5] }, 'values', /at least 2 values, got 1/],
		['one subgroup', { chart: 'xbar-s', subgroups: [[1, 2]] }, 'subgroups', /at least 2 subgroups/],
		['missing data', { chart: 'xbar-r' }, 'subgroups', /is required for chart 'xbar-r'/],
		[
			'values for X-bar',
			{ chart: 'xbar-s', values: [1, 2, 3] },
			'subgroups',
			/'values' is for 'i-mr'/
		],
		[
			'missing values for I-MR',
			{
				chart: 'i-mr',
				subgroups: [
					[1, 2],
					[3, 4]
				]
			},
			'values',
			/is required/
		],
		[
			'LSL ≥ USL',
			{ chart: 'i-mr', values: [1, 2, 3], lsl: 5, usl: 4 },
			'lsl',
			/LSL 5 must be below USL 4/
		],
		[
			'zero variation (X-bar/R)',
			{
				chart: 'xbar-r',
				subgroups: [
					[2, 2],
					[3, 3]
				]
			},
			'subgroups',
			/zero variation: every subgroup range is 0/
		],
		[
			'overflowing magnitudes',
			{ chart: 'i-mr', values: [1e308, -1e308, 1e308] },
			'values',
			/too large/
		],
		[
			'zero variation (I-MR)',
			{ chart: 'i-mr', values: [4, 4, 4] },
			'values',
			/zero variation: all moving ranges are 0/
		]
	])('%s', (_label, input, field, message) => {
		const errs = errors(input);
		const hit = errs.find((e) => e.field === field);
		expect(hit, JSON.stringify(errs)).toBeDefined();
		expect(hit?.message).toMatch(message);
	});
	it('reports data and spec problems together', () => {
		const errs = errors({ chart: 'xbar-r', subgroups: [[1, 2], [3]], lsl: 9, usl: 1 });
		expect(errs.map((e) => e.field)).toEqual(['subgroups[1]', 'lsl']);
	});
});

describe('a large study', () => {
	// Its speed is measured by `npm run bench:spc` (figures printed), not asserted here.
	it('1,000 subgroups of 5 with all twelve rules give limits, capability and in-range indices', () => {
		const subgroups = Array.from({ length: 1000 }, (_, i) =>
			Array.from({ length: 5 }, (_, j) => 100 + Math.sin(i * 7.1 + j * 3.3) * 2)
		);
		const r = ok({ chart: 'xbar-r', subgroups, lsl: 90, usl: 110, rules: [...RULE_IDS] });
		expect(r.capability.cpk).not.toBeNull();
		expect(r.limits.location.ucl).toBeGreaterThan(r.limits.location.cl as number);
		for (const v of r.violations) {
			expect(v.index).toBeGreaterThanOrEqual(0);
			expect(v.index).toBeLessThan(1000);
		}
	});
});
