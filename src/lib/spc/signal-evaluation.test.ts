import { describe, expect, it } from 'vitest';
import type { SourceSubgroup } from './chart-input';
import { computeLimits } from './control-chart';
import { pointsFor } from './chart-detail';
import { runIdFor, signalCandidates } from './signal-evaluation';

const at = (i: number) => new Date(Date.UTC(2026, 0, 1, 0, i));
const runs = (values: readonly number[]): SourceSubgroup[] =>
	values.map((v, i) => ({
		key: `run:${i + 1}`,
		label: `run ${i + 1}`,
		boardId: null,
		boardIds: [i + 1],
		at: at(i),
		values: [v]
	}));

// A baseline of 20 values around 10 (moving ranges about 1), then a new point far above.
const baseline = [10, 11, 9, 10, 12, 9, 10, 11, 10, 9, 11, 10, 10, 9, 11, 10, 12, 10, 9, 10];
const limits = computeLimits('i-mr', pointsFor('i-mr', runs(baseline)));
const c = { chartKind: 'i-mr', rules: ['we-1'] };

describe('signalCandidates', () => {
	it('a point beyond the frozen UCL after the baseline is a location signal (WE rule 1)', () => {
		const data = runs([...baseline, 30]);
		const out = signalCandidates(c, data, limits, at(19));
		expect(limits.location.ucl).toBeLessThan(30);
		// The jump of 20 also lies above the moving-range UCL: one signal on each chart part.
		expect(out.map((v) => v.chartPart)).toEqual(['location', 'dispersion']);
		expect(out[0]).toMatchObject({
			rule: 'we-1',
			pointKey: 'run:21',
			pointKeys: ['run:21'],
			boardIds: [21],
			pointAt: at(20),
			value: 30,
			previousKey: 'run:20'
		});
		expect(out[1].value).toBe(20);
	});

	it('points inside the baseline period are not judged again', () => {
		const data = runs([...baseline, 30]);
		expect(signalCandidates(c, data, limits, at(20))).toEqual([]);
	});

	it('nothing when the chart kind no longer matches the frozen limits', () => {
		const data = runs([...baseline, 30]);
		expect(signalCandidates({ ...c, chartKind: 'xbar-r' }, data, limits, null)).toEqual([]);
		expect(signalCandidates(c, [], limits, null)).toEqual([]);
	});
});

describe('runIdFor', () => {
	const recent = [
		{
			id: 7,
			rule: 'we-2',
			chartPart: 'location',
			pointKey: 'run:5',
			pointKeys: ['run:3', 'run:5'],
			runId: 4
		},
		{
			id: 4,
			rule: 'we-2',
			chartPart: 'location',
			pointKey: 'run:3',
			pointKeys: ['run:2', 'run:3'],
			runId: 4
		}
	];

	it('joins the run of a signal that ended on the previous point or shares a point', () => {
		const signal = { id: 9, rule: 'we-2', chartPart: 'location' };
		expect(runIdFor(recent, signal, { previousKey: 'run:5', pointKeys: ['run:6'] })).toBe(4);
		expect(runIdFor(recent, signal, { previousKey: 'run:8', pointKeys: ['run:3', 'run:9'] })).toBe(
			4
		);
	});

	it('starts its own run otherwise, or for another rule or chart part', () => {
		expect(
			runIdFor(
				recent,
				{ id: 9, rule: 'we-2', chartPart: 'location' },
				{ previousKey: 'run:8', pointKeys: ['run:9'] }
			)
		).toBe(9);
		expect(
			runIdFor(
				recent,
				{ id: 9, rule: 'we-1', chartPart: 'location' },
				{ previousKey: 'run:5', pointKeys: ['run:6'] }
			)
		).toBe(9);
		expect(
			runIdFor(
				recent,
				{ id: 9, rule: 'we-2', chartPart: 'dispersion' },
				{ previousKey: 'run:5', pointKeys: ['run:6'] }
			)
		).toBe(9);
	});
});
