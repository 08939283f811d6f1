import { describe, expect, it } from 'vitest';
import { groupBoards, groupRuns, printParameterValue, valuesPerPoint } from './chart-input';

const at = (i: number) => new Date(Date.UTC(2026, 0, 1, 0, i));

describe('printParameterValue', () => {
	it('reads logged numbers and numeric text; refuses blanks, words and non-finite values', () => {
		const run = (parameters: Record<string, unknown>) => ({
			parameters,
			ambientTempC: 22.5,
			relativeHumidityPct: null
		});
		expect(printParameterValue(run({ speed: 40 }), 'speed')).toBe(40);
		expect(printParameterValue(run({ speed: ' 41.5 ' }), 'speed')).toBe(41.5);
		expect(printParameterValue(run({ speed: '' }), 'speed')).toBeNull();
		expect(printParameterValue(run({ speed: 'fast' }), 'speed')).toBeNull();
		expect(printParameterValue(run({ speed: Infinity }), 'speed')).toBeNull();
		expect(printParameterValue(run({}), 'speed')).toBeNull();
		// Ambient conditions come from their own columns unless logged as a parameter.
		expect(printParameterValue(run({}), 'ambientTempC')).toBe(22.5);
		expect(printParameterValue(run({ ambientTempC: 21 }), 'ambientTempC')).toBe(21);
		expect(printParameterValue(run({}), 'relativeHumidityPct')).toBeNull();
	});
});

describe('groupRuns', () => {
	const runs = [1, 2, 3, 4, 5].map((v, i) => ({
		id: 10 + i,
		startedAt: at(i),
		lineCode: 'SMT-1',
		value: v
	}));

	it('one run per point, keyed and labelled by run', () => {
		const out = groupRuns(runs, 1, 200);
		expect(out.map((s) => s.key)).toEqual(['run:10', 'run:11', 'run:12', 'run:13', 'run:14']);
		expect(out[0]).toMatchObject({ label: 'run 10 · SMT-1', values: [1], boardId: null });
	});

	it('n consecutive runs per point: the incomplete newest group waits; newest `limit` kept', () => {
		const out = groupRuns(runs, 2, 200);
		expect(out.map((s) => s.values)).toEqual([
			[1, 2],
			[3, 4]
		]);
		expect(out[1]).toMatchObject({ key: 'run:12', label: 'runs 12–13 · SMT-1', at: at(3) });
		expect(groupRuns(runs, 2, 1).map((s) => s.key)).toEqual(['run:12']);
	});
});

describe('groupBoards', () => {
	const boards = [0, 1, 2].map((i) => ({
		id: 100 + i,
		serial: `S${i}`,
		at: at(i),
		lineCode: 'SMT-2',
		values: [i, i + 2],
		stats: undefined
	}));

	it('one board per point with its pads', () => {
		const out = groupBoards(
			boards,
			{ subgroupMode: 'board', subgroupSize: 1, chartKind: 'xbar-r' },
			200
		);
		expect(out[2]).toMatchObject({ key: 'board:102', boardIds: [102], values: [2, 4] });
	});

	it('I-MR and consecutive boards chart each board mean', () => {
		const imr = groupBoards(
			boards,
			{ subgroupMode: 'board', subgroupSize: 1, chartKind: 'i-mr' },
			200
		);
		expect(imr.map((s) => s.values)).toEqual([[1], [2], [3]]);
		const pairs = groupBoards(
			boards,
			{ subgroupMode: 'consecutive', subgroupSize: 2, chartKind: 'xbar-r' },
			200
		);
		expect(pairs).toHaveLength(1);
		expect(pairs[0]).toMatchObject({
			key: 'board:100',
			label: 'S0…S1 · SMT-2',
			boardId: 101,
			boardIds: [100, 101],
			values: [1, 2]
		});
	});

	it('values per point', () => {
		expect(valuesPerPoint({ subgroupMode: 'consecutive', subgroupSize: 5 })).toBe(5);
		expect(valuesPerPoint({ subgroupMode: 'board', subgroupSize: 5 })).toBe(1);
	});
});
