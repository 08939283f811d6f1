import Database from 'better-sqlite3';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { addRuns, seedFactory } from './test-fixtures';
import { createCharacteristic } from './characteristics';
import { chartDetail } from './chart-service';
import { chartJson } from '$lib/spc/api-json';
import { cachedChartJson, dataVersion } from './chart-json-cache';

let db: Db;
let dir: string;
let close: () => void;
let f: ReturnType<typeof seedFactory>;
let chartId: number;
const start = new Date('2026-11-03T06:00:00Z');

beforeEach(() => {
	({ db, dir, close } = openTestDatabase());
	f = seedFactory(db);
	addRuns(
		db,
		{ productId: f.product.id, lineId: f.line1.id, key: 'squeegeeSpeedMmS', start },
		[40, 41, 39, 40, 42, 38, 40, 41, 39, 40]
	);
	chartId = createCharacteristic(
		db,
		{
			name: 'Speed',
			productId: f.product.id,
			lineIds: [f.line1.id],
			measure: 'print-parameter',
			parameterKey: 'squeegeeSpeedMmS',
			chartKind: 'i-mr'
		},
		null
	).id;
});
afterEach(() => close());

/** The API answer computed afresh, and a counting cached read of it. */
const fresh = () => JSON.stringify(chartJson(chartDetail(db, chartId)));
let computed = 0;
const cached = (key = `${chartId}:200`) =>
	cachedChartJson(db, key, () => {
		computed++;
		return chartJson(chartDetail(db, chartId));
	});
const points = (text: string) => (JSON.parse(text).points as unknown[]).length;

describe('cachedChartJson', () => {
	beforeEach(() => {
		computed = 0;
	});

	it('answers a repeated request from the cache, the same text as computed afresh', () => {
		const first = cached();
		const second = cached();
		expect(computed).toBe(1);
		expect(second).toBe(first);
		expect(second).toBe(fresh());
		expect(points(second)).toBe(10);
	});

	it("recomputes after a commit on the app's own connection", () => {
		expect(points(cached())).toBe(10);
		const before = dataVersion(db);
		addRuns(
			db,
			{
				productId: f.product.id,
				lineId: f.line1.id,
				key: 'squeegeeSpeedMmS',
				start: new Date(start.getTime() + 3_600_000)
			},
			[55]
		);
		expect(dataVersion(db)).not.toBe(before);
		const after = cached();
		expect(computed).toBe(2);
		expect(points(after)).toBe(11);
		expect(after).toBe(fresh());
	});

	it('recomputes after a commit by another connection (the ingest has its own)', () => {
		expect(points(cached())).toBe(10);
		const other = new Database(join(dir, 'test.db'));
		try {
			other
				.prepare(
					`insert into print_runs (line_id, product_id, parameters, started_at, ended_at, boards_printed)
					 values (?, ?, '{"squeegeeSpeedMmS":44}', ?, ?, 1)`
				)
				.run(f.line1.id, f.product.id, start.getTime() + 7_200_000, start.getTime() + 7_230_000);
		} finally {
			other.close();
		}
		const after = cached();
		expect(computed).toBe(2);
		expect(points(after)).toBe(11);
		expect(JSON.parse(after).points.at(-1).location).toBe(44);
	});

	it('keeps nothing when the computation fails, and at most maxEntries answers', () => {
		expect(() =>
			cachedChartJson(db, 'bad', () => {
				computed++;
				throw new Error('no such chart');
			})
		).toThrow('no such chart');
		expect(() =>
			cachedChartJson(db, 'bad', () => {
				computed++;
				throw new Error('no such chart');
			})
		).toThrow('no such chart');
		expect(computed).toBe(2);
		const keep = (key: string) => cachedChartJson(db, key, () => (computed++, { key }), 2);
		keep('a');
		keep('b');
		keep('a'); // a is now the most recently used
		keep('c'); // evicts b
		expect(computed).toBe(5);
		keep('a');
		keep('c');
		expect(computed).toBe(5);
		keep('b');
		expect(computed).toBe(6);
	});
});
