import { describe, it, expect } from 'vitest';
import ref from '../../../reference/printlog/check-values.json';
import { DEFAULT_TENSION, checkTensionReadings } from './stencil-tension';
import { formatFieldError } from './field-error';

describe('checkTensionReadings', () => {
	it('defaults to the minimum in the reference file (from memory / common practice)', () => {
		expect(DEFAULT_TENSION.minTensionNPerCm).toBe(ref.stencil.minTensionNPerCm.value);
	});

	it('summarises five readings; a reading exactly at the minimum passes', () => {
		// Mean by hand: (38 + 36 + 35 + 40 + 41) / 5 = 190 / 5 = 38.
		const result = checkTensionReadings([38, 36, 35, 40, 41]);
		expect(result).toEqual({ errors: [], low: [], minimumNPerCm: 35, meanNPerCm: 38, pass: true });
	});

	const cases: [string, unknown[], number, string[], number[]][] = [
		['one low reading', [38, 36, 34.9, 40, 37], 35, [], [2]],
		['a stricter setting', [38, 36, 37], 37, [], [1]],
		['n = 1', [36], 35, [], []],
		['empty', [], 35, ['readings: must list at least one reading in N/cm'], []],
		[
			'NaN and negative',
			[Number.NaN, -3, 40],
			35,
			[
				'readings[0]: must be a tension in N/cm, > 0 and ≤ 100 (got NaN)',
				'readings[1]: must be a tension in N/cm, > 0 and ≤ 100 (got -3)'
			],
			[]
		],
		[
			'N/m typed as N/cm',
			[3800],
			35,
			['readings[0]: must be a tension in N/cm, > 0 and ≤ 100 (got 3800)'],
			[]
		]
	];
	it.each(cases)('%s', (_name, readings, min, errors, lowIndexes) => {
		const result = checkTensionReadings(readings, { minTensionNPerCm: min });
		expect(result.errors.map(formatFieldError)).toEqual(errors);
		expect(result.low.map((l) => l.index)).toEqual(lowIndexes);
		expect(result.pass).toBe(errors.length === 0 && lowIndexes.length === 0 && readings.length > 0);
	});

	it('refuses a bad minimum setting', () => {
		expect(
			checkTensionReadings([40], { minTensionNPerCm: 0 }).errors.map(formatFieldError)
		).toEqual(['minTensionNPerCm: must be > 0 and ≤ 100 N/cm (got 0)']);
	});
});
