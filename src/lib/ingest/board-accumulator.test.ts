import { describe, expect, it } from 'vitest';
import { max, mean, min, sampleStandardDeviation } from 'simple-statistics';
import check from '../../../reference/ingest/aggregate-check-values.json';
import {
	AGGREGATED_MEASURES,
	createBoardAccumulator,
	mergeBoardAggregates,
	type AggregatableRow,
	type AggregatedMeasure,
	type BoardAggregate,
	type ResultCode
} from './board-accumulator';

const CODES: Record<string, ResultCode> = { pass: 0, warn: 1, fail: 2 };
type CheckStats = {
	count: number;
	mean: number;
	sd: number | null;
	min: number;
	max: number;
	range: number;
};

function rowsOf(serial: keyof typeof check.rows): AggregatableRow[] {
	return check.rows[serial].map((r) => ({ ...r, result: CODES[r.result] }));
}

function expectClose(
	actual: BoardAggregate,
	expected: Record<AggregatedMeasure, CheckStats>
): void {
	for (const m of AGGREGATED_MEASURES) {
		const a = actual[m];
		const e = expected[m];
		expect(a.count).toBe(e.count);
		expect(a.mean).toBeCloseTo(e.mean, 10);
		expect(a.sd).toBeCloseTo(e.sd as number, 10);
		expect(a.min).toBe(e.min);
		expect(a.max).toBe(e.max);
		expect(a.range).toBeCloseTo(e.range, 10);
	}
}

describe('createBoardAccumulator against exact two-pass values (reference/ingest/aggregate-check-values.json)', () => {
	for (const serial of Object.keys(check.rows) as (keyof typeof check.rows)[]) {
		it(serial, () => {
			const acc = createBoardAccumulator();
			for (const row of rowsOf(serial)) acc.add(row);
			const result = acc.finish();
			expectClose(result, check.boards[serial]);
			expect(result.results).toEqual(check.boards[serial].results);
			expect(result.rows).toBe(3);
		});
	}

	it('merge pools two boards like one accumulator over all rows', () => {
		const a = createBoardAccumulator();
		const b = createBoardAccumulator();
		for (const row of rowsOf('RB-TESTBOARD-0001')) a.add(row);
		for (const row of rowsOf('RB-TESTBOARD-0002')) b.add(row);
		const before = JSON.stringify(a.finish());
		const pooled = a.merge(b).finish();
		expectClose(pooled, check.pooled);
		expect(pooled.results).toEqual(check.pooled.results);
		expect(JSON.stringify(a.finish())).toBe(before); // merge leaves its inputs alone
	});

	it('mergeBoardAggregates pools stored (finished) aggregates', () => {
		const finished = (['RB-TESTBOARD-0001', 'RB-TESTBOARD-0002'] as const).map((serial) => {
			const acc = createBoardAccumulator();
			for (const row of rowsOf(serial)) acc.add(row);
			return acc.finish();
		});
		const pooled = mergeBoardAggregates(finished);
		expectClose(pooled, check.pooled);
		expect(pooled.rows).toBe(6);
	});
});

describe('createBoardAccumulator against simple-statistics', () => {
	it('matches mean, sampleStandardDeviation, min, max on 1000 generated rows', () => {
		let seed = 7;
		const next = () => {
			seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
			return seed / 2 ** 32;
		};
		const rows: AggregatableRow[] = Array.from({ length: 1000 }, () => ({
			volumePct: 60 + next() * 80,
			areaPct: 80 + next() * 40,
			heightUm: 100 + next() * 40,
			offsetXUm: next() * 60 - 30,
			offsetYUm: next() * 60 - 30,
			result: Math.floor(next() * 3) as ResultCode
		}));
		const acc = createBoardAccumulator();
		rows.forEach((r) => acc.add(r));
		// Split into three uneven parts and merge: same answer as one pass.
		const parts = [createBoardAccumulator(), createBoardAccumulator(), createBoardAccumulator()];
		rows.forEach((r, i) => parts[i < 10 ? 0 : i < 700 ? 1 : 2].add(r));
		const merged = parts[0].merge(parts[1]).merge(parts[2]).finish();
		const direct = acc.finish();
		for (const m of AGGREGATED_MEASURES) {
			const values = rows.map((r) => r[m]);
			for (const result of [direct, merged]) {
				expect(result[m].mean).toBeCloseTo(mean(values), 10);
				expect(result[m].sd).toBeCloseTo(sampleStandardDeviation(values), 10);
				expect(result[m].min).toBe(min(values));
				expect(result[m].max).toBe(max(values));
			}
		}
		expect(direct.results.pass + direct.results.warn + direct.results.fail).toBe(1000);
		expect(merged.results).toEqual(direct.results);
	});

	it('stays accurate with a large offset (Welford; reference stability case)', () => {
		const acc = createBoardAccumulator();
		for (const v of check.stability.values) {
			acc.add({ volumePct: v, areaPct: v, heightUm: v, offsetXUm: v, offsetYUm: v, result: 0 });
		}
		const s = acc.finish().volumePct;
		expect(s.mean).toBe(check.stability.mean);
		expect((s.sd as number) ** 2).toBeCloseTo(check.stability.variance, 9);
	});
});

describe('edge cases', () => {
	const row = (v: number): AggregatableRow => ({
		volumePct: v,
		areaPct: v,
		heightUm: v,
		offsetXUm: v,
		offsetYUm: v,
		result: 0
	});
	it.each([
		{
			name: 'empty',
			values: [],
			expected: { count: 0, mean: null, sd: null, min: null, max: null, range: null }
		},
		{
			name: 'n = 1',
			values: [101.5],
			expected: { count: 1, mean: 101.5, sd: null, min: 101.5, max: 101.5, range: 0 }
		},
		{
			name: 'zero spread',
			values: [100, 100, 100],
			expected: { count: 3, mean: 100, sd: 0, min: 100, max: 100, range: 0 }
		},
		{
			name: 'NaN skipped',
			values: [NaN, 98, NaN, 102],
			expected: { count: 2, mean: 100, sd: Math.sqrt(8), min: 98, max: 102, range: 4 }
		}
	])('$name', ({ values, expected }) => {
		const acc = createBoardAccumulator();
		values.forEach((v) => acc.add(row(v)));
		expect(acc.finish().volumePct).toEqual(expected);
		expect(acc.finish().rows).toBe(values.length);
	});

	it('merging with an empty accumulator changes nothing', () => {
		const a = createBoardAccumulator();
		a.add(row(98));
		a.add(row(102));
		expect(a.merge(createBoardAccumulator()).finish()).toEqual(a.finish());
		expect(createBoardAccumulator().merge(a).finish()).toEqual(a.finish());
	});

	it('mergeBoardAggregates of nothing is empty', () => {
		expect(mergeBoardAggregates([]).volumePct.count).toBe(0);
		expect(mergeBoardAggregates([]).results).toEqual({ pass: 0, warn: 0, fail: 0 });
	});
});
