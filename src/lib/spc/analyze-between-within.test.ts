import { describe, it, expect } from 'vitest';
import ref from '../../../reference/spc/between-within-example.json';
import { analyzeStudy, type AnalyzeResult } from './analyze';
import type { ControlLimits } from './chart-types';

// Hand-computed values are rounded to 6 decimals in the reference file.
const TOLERANCE = 1e-5;

function ok(input: unknown): AnalyzeResult {
	const out = analyzeStudy(input);
	if (!out.ok) throw new Error(JSON.stringify(out.errors));
	return out.result;
}

function expectLimits(actual: ControlLimits | undefined, expected: ControlLimits) {
	expect(actual).toBeDefined();
	for (const key of ['lcl', 'cl', 'ucl'] as const) {
		expect(Math.abs((actual as ControlLimits)[key] - expected[key]), key).toBeLessThan(TOLERANCE);
	}
}

describe('POST /api/spc/analyze core: between/within against hand-computed examples', () => {
	it('n = 5: individuals limits of the means, R chart within, capability from R̄/d2 and s', () => {
		const ex = ref.rangeExample;
		const r = ok({ chart: 'between-within', subgroups: ex.subgroups, ...ex.specs });
		expect(Object.keys(r.limits).sort()).toEqual(['dispersion', 'location', 'movingRange']);
		expectLimits(r.limits.location, ex.expected.location);
		expectLimits(r.limits.movingRange, ex.expected.movingRange);
		expectLimits(r.limits.dispersion, ex.expected.dispersion);
		const c = r.capability;
		for (const key of ['sigmaWithin', 'sigmaOverall', 'cp', 'cpk', 'pp', 'ppk'] as const) {
			expect(Math.abs((c[key] as number) - ex.expected[key]), key).toBeLessThan(TOLERANCE);
		}
		expect(c.n).toBe(25);
		expect(r.violations).toEqual([]);
		expect(JSON.parse(JSON.stringify(r))).toEqual(r);
	});

	it('n = 12: the within chart is the S chart with s̄/c4', () => {
		const ex = ref.standardDeviationExample;
		const patterns = ex.patterns as Record<string, number[]>;
		const subgroups = ex.subgroupMeans.map((m, i) =>
			patterns[ex.subgroupPatterns[i]].map((d) => m + d)
		);
		const r = ok({ chart: 'between-within', subgroups });
		expectLimits(r.limits.location, ex.expected.location);
		expectLimits(r.limits.movingRange, ex.expected.movingRange);
		expectLimits(r.limits.dispersion, ex.expected.dispersion);
		expect(Math.abs((r.capability.sigmaWithin as number) - ex.expected.sigmaWithin)).toBeLessThan(
			TOLERANCE
		);
		expect(Math.abs(r.capability.sigmaOverall - ex.expected.sigmaOverall)).toBeLessThan(TOLERANCE);
		expect(r.capability.cp).toBeNull();
	});

	it('a jump between board means is reported on the moving-range chart as well', () => {
		// Means alternate 10 / 10.5 (moving ranges 0.5), then jump to 14 (moving range 3.5).
		const means = [10, 10.5, 10, 10.5, 10, 10.5, 10, 10.5, 14];
		const subgroups = means.map((m) => [-1, 0, 0, 0, 1].map((d) => m + d));
		const mrBar = (7 * 0.5 + 3.5) / 8; // 0.875
		const d2 = 2 / Math.sqrt(Math.PI);
		const mrUcl = (1 + (3 * Math.sqrt(2 - 4 / Math.PI)) / d2) * mrBar; // 2.858 < 3.5
		const grandMean = 96 / 9;
		const locationUcl = grandMean + (3 * mrBar) / d2; // 12.99 < 14
		const r = ok({ chart: 'between-within', subgroups, rules: ['we-1'] });
		expect(Math.abs((r.limits.movingRange as ControlLimits).ucl - mrUcl)).toBeLessThan(1e-9);
		expect(Math.abs(r.limits.location.ucl - locationUcl)).toBeLessThan(1e-9);
		expect(r.violations).toEqual([
			{ rule: 'we-1', chart: 'location', index: 8, points: [8] },
			{ rule: 'we-1', chart: 'moving-range', index: 8, points: [8] }
		]);
	});
});
