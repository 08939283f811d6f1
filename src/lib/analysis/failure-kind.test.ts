import { describe, expect, it } from 'vitest';
import {
	DEFAULT_FAILURE_WINDOWS,
	FAILURE_KINDS,
	FAILURE_KIND_LABELS,
	failureKindOf,
	pareto,
	type PadMeasures
} from './failure-kind';

const nominal: PadMeasures = {
	volumePct: 100,
	areaPct: 100,
	heightUm: 120,
	offsetXUm: 0,
	offsetYUm: 0,
	foilUm: 120
};

describe('failureKindOf', () => {
	it('uses the REFERENCE-FACTS volume window (50–150 %, trade practice)', () => {
		expect(DEFAULT_FAILURE_WINDOWS.volumePct).toEqual({ low: 50, high: 150 });
	});

	it('names the measure that broke its window, with its direction', () => {
		expect(failureKindOf({ ...nominal, volumePct: 42 })).toEqual({
			kind: 'volume-low',
			reach: (100 - 42) / 50
		});
		expect(failureKindOf({ ...nominal, volumePct: 163 }).kind).toBe('volume-high');
		// 48 µm on a 120 µm foil = 40 %: (100 − 40) / 50 = 1.2 half-widths below.
		expect(failureKindOf({ ...nominal, heightUm: 48 })).toEqual({
			kind: 'height-low',
			reach: 1.2
		});
		expect(failureKindOf({ ...nominal, heightUm: 180 }).kind).toBe('height-high');
		expect(failureKindOf({ ...nominal, areaPct: 30 }).kind).toBe('area-low');
		expect(failureKindOf({ ...nominal, areaPct: 170 }).kind).toBe('area-high');
		expect(failureKindOf({ ...nominal, offsetXUm: -130 })).toEqual({
			kind: 'offset-x',
			reach: 1.3
		});
		expect(failureKindOf({ ...nominal, offsetYUm: 101 }).kind).toBe('offset-y');
	});

	it('takes the first measure outside its window, in the order volume, height, area, offsets', () => {
		// Volume 40 % (1.2 half-widths) and offset X 150 µm (1.5): volume comes first.
		expect(failureKindOf({ ...nominal, volumePct: 40, offsetXUm: 150 })).toEqual({
			kind: 'volume-low',
			reach: 1.2
		});
		// A low deposit is also low in height (36 µm of 120 = 30 %): still a volume failure.
		expect(failureKindOf({ ...nominal, volumePct: 30, heightUm: 36 }).kind).toBe('volume-low');
		// Volume inside (60 %), height outside (40 %): height.
		expect(failureKindOf({ ...nominal, volumePct: 60, heightUm: 48 }).kind).toBe('height-low');
	});

	it('within every window, the measure furthest from nominal; ties in the same order', () => {
		// Volume 55 % (0.9) against offset Y 95 µm (0.95): offset Y.
		expect(failureKindOf({ ...nominal, volumePct: 55, offsetYUm: 95 }).kind).toBe('offset-y');
		// Volume 55 % and height 55 % of the foil (0.9 each): volume comes first.
		expect(failureKindOf({ ...nominal, volumePct: 55, heightUm: 66 }).kind).toBe('volume-low');
	});

	it('judges height only with a foil thickness and volume only when measured', () => {
		const r = failureKindOf({ ...nominal, heightUm: 10, foilUm: null, areaPct: 80 });
		expect(r.kind).toBe('area-low');
		expect(failureKindOf({ ...nominal, volumePct: null, offsetYUm: 20 }).kind).toBe('offset-y');
	});

	it('a pad failed by tighter machine limits keeps its worst measure, with reach ≤ 1', () => {
		// Demo-like: the machine fails volume below 60 %; 55 % is inside 50–150 %.
		const r = failureKindOf({ ...nominal, volumePct: 55 });
		expect(r.kind).toBe('volume-low');
		expect(r.reach).toBeCloseTo(0.9, 12);
	});

	it('every kind has a label', () => {
		for (const k of FAILURE_KINDS) expect(FAILURE_KIND_LABELS[k]).toMatch(/^[A-Z][a-z]+ /);
	});
});

describe('pareto', () => {
	it('sorts largest first with shares and a cumulative share ending at 1', () => {
		// 5, 3, 2 of 10 → 0.5, 0.3, 0.2; running 0.5, 0.8, 1.
		const rows = pareto(
			new Map([
				['b', 3],
				['a', 5],
				['z', 0],
				['c', 2]
			])
		);
		expect(rows.map((r) => r.key)).toEqual(['a', 'b', 'c']);
		expect(rows.map((r) => r.share)).toEqual([0.5, 0.3, 0.2]);
		expect(rows.map((r) => r.cumulativeShare)).toEqual([0.5, 0.8, 1]);
		expect(pareto(new Map())).toEqual([]);
	});

	it('breaks ties by key, so the order is stable', () => {
		expect(
			pareto(
				new Map([
					['y', 1],
					['x', 1]
				])
			).map((r) => r.key)
		).toEqual(['x', 'y']);
	});
});
