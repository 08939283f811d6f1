import { describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { processCapability, sampleStandardDeviation } from '$lib/spc';
import { pooledStats, summaryCapability } from './summary-capability';

const examples = JSON.parse(readFileSync('reference/spc/worked-examples.json', 'utf8'));
const values: number[] = examples.montgomeryRungerTable16_3.values;

function statsOf(group: number[]) {
	const mean = group.reduce((a, v) => a + v, 0) / group.length;
	return { n: group.length, mean, sd: group.length > 1 ? sampleStandardDeviation(group) : 0 };
}

describe('pooledStats', () => {
	it('equals the statistics of the raw values (sum-of-squares decomposition)', () => {
		const groups = [values.slice(0, 7), values.slice(7, 8), values.slice(8, 20)].map(statsOf);
		const pooled = pooledStats(groups);
		expect(pooled.n).toBe(20);
		expect(pooled.mean).toBeCloseTo(99.095, 10); // REFERENCE-FACTS d.2 full-precision mean
		expect(pooled.sd).toBeCloseTo(sampleStandardDeviation(values), 10);
	});

	it.each([[[]], [[{ n: 1, mean: 5, sd: 0 }]]])('refuses fewer than 2 values: %j', (groups) => {
		expect(() => pooledStats(groups)).toThrow('at least 2 values');
	});
});

describe('summaryCapability', () => {
	it.each([
		[95, 105, 100],
		[null, 104, null],
		[94, null, null]
	])('matches processCapability on the raw values (LSL %s, USL %s)', (lsl, usl, target) => {
		const groups = [values.slice(0, 10), values.slice(10)].map(statsOf);
		const fromSummary = summaryCapability({ groups, sigmaWithin: 2.295, lsl, usl, target });
		const fromValues = processCapability({ values, sigmaWithin: 2.295, lsl, usl, target });
		for (const key of ['cp', 'cpk', 'pp', 'ppk', 'cpm', 'sigmaOverall', 'mean'] as const) {
			if (fromValues[key] === null) expect(fromSummary[key]).toBeNull();
			else expect(fromSummary[key]).toBeCloseTo(fromValues[key] as number, 10);
		}
		expect(fromSummary.cpkInterval?.lower).toBeCloseTo(fromValues.cpkInterval?.lower ?? NaN, 10);
		expect(fromSummary.expectedOverall?.ppmTotal).toBeCloseTo(
			fromValues.expectedOverall?.ppmTotal ?? NaN,
			6
		);
	});

	it('refuses LSL above USL', () => {
		expect(() =>
			summaryCapability({ groups: [statsOf(values)], sigmaWithin: 1, lsl: 5, usl: 1, target: null })
		).toThrow('LSL 5 must be below USL 1');
	});
});
