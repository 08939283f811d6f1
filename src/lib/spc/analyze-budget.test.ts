import { describe, expect, it } from 'vitest';
import { analyzeStudy, MAX_STUDY_SUBGROUP_SIZE, MAX_STUDY_VALUES } from './analyze';

describe('ad-hoc study work budget', () => {
	it('refuses more values than the budget before validating them', () => {
		const values = new Array(MAX_STUDY_VALUES + 1).fill('not even a number');
		const outcome = analyzeStudy({ chart: 'i-mr', values });
		expect(outcome).toEqual({
			ok: false,
			tooLarge: true,
			errors: [{ field: 'values', message: '50,001 values; the limit is 50,000 per study' }]
		});
	});

	it('counts every subgroup together, and names an oversized subgroup', () => {
		const subgroups = new Array(MAX_STUDY_VALUES / 5 + 1).fill([1, 2, 3, 4, 5]);
		const all = analyzeStudy({ chart: 'xbar-r', subgroups });
		expect(all.ok).toBe(false);
		expect(!all.ok && all.errors[0].field).toBe('subgroups');
		const wide = analyzeStudy({
			chart: 'xbar-s',
			subgroups: [[1, 2], new Array(MAX_STUDY_SUBGROUP_SIZE + 1).fill(1)]
		});
		expect(wide).toMatchObject({ ok: false, tooLarge: true, errors: [{ field: 'subgroups[1]' }] });
	});

	it('lets a study at the budget through to the computation', () => {
		const values = Array.from({ length: MAX_STUDY_VALUES }, (_, i) => 10 + (i % 7) * 0.1);
		const outcome = analyzeStudy({ chart: 'i-mr', values });
		expect(outcome.ok).toBe(true);
	});
});
