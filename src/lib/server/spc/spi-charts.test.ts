import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { betweenWithinChart, sampleStandardDeviation } from '$lib/spc';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { mailOutbox, spiBoards, spiImports, spiPadMeasurements, spiPads } from '../db/schema';
import type { Actor } from '$lib/access';
import { seedFactory } from './test-fixtures';
import { createCharacteristic, setFollowing } from './characteristics';
import { chartDetail } from './chart-service';
import { freezeLimits } from './limits-lifecycle';
import { evaluateSignalsAfterIngest, listSignals } from './signals';

let db: Db;
let close: () => void;
let f: ReturnType<typeof seedFactory>;
let actor: Actor;
let importId: number;
const start = Date.parse('2026-11-03T06:00:00Z');

beforeEach(() => {
	({ db, close } = openTestDatabase());
	f = seedFactory(db);
	actor = {
		kind: 'user',
		id: f.engineer.id,
		email: f.engineer.email,
		name: f.engineer.name,
		role: 'engineer'
	};
	importId = db
		.insert(spiImports)
		.values({
			source: 'upload',
			fileName: 't.csv',
			sha256: 'x',
			sizeBytes: 1,
			status: 'imported',
			createdBy: 'system',
			startedAt: new Date(start),
			finishedAt: new Date(start)
		})
		.returning()
		.get().id;
});
afterEach(() => close());

const pads = ['R1', 'R2', 'C1', 'U1'];
let padIds: number[] = [];

/** Boards whose 4 pad volumes are given; aggregates computed here as ingest would. */
function addBoards(boards: number[][], offset = 0): number[] {
	if (padIds.length === 0 || !db.select().from(spiPads).get()) {
		padIds = pads.map(
			(refdes) =>
				db.insert(spiPads).values({ productCode: 'PB-100', refdes, pad: '1' }).returning().get().id
		);
	}
	return boards.map((values, i) => {
		const mean = values.reduce((a, v) => a + v, 0) / values.length;
		const board = db
			.insert(spiBoards)
			.values({
				serial: `FMW-${String(offset + i).padStart(5, '0')}`,
				inspectedAt: new Date(start + (offset + i) * 60_000),
				lineCode: 'SMT-1',
				productCode: 'PB-100',
				lineId: f.line1.id,
				productId: f.product.id,
				importId,
				padCount: values.length,
				passCount: values.length,
				warnCount: 0,
				failCount: 0,
				volumePctCount: values.length,
				volumePctMean: mean,
				volumePctSd: sampleStandardDeviation(values),
				volumePctMin: Math.min(...values),
				volumePctMax: Math.max(...values),
				volumePctRange: Math.max(...values) - Math.min(...values)
			})
			.returning()
			.get();
		values.forEach((v, k) =>
			db
				.insert(spiPadMeasurements)
				.values({
					boardId: board.id,
					padId: padIds[k],
					volumeCentiPct: Math.round(v * 100),
					areaCentiPct: 10000,
					heightCentiUm: 12000,
					offsetXCentiUm: 0,
					offsetYCentiUm: 0,
					result: 0
				})
				.run()
		);
		return board.id;
	});
}

// Invented pad volumes (%), 4 pads per board: board-to-board shifts larger than within-board spread.
const baseline = [
	[98, 102, 101, 99],
	[103, 105, 104, 106],
	[95, 97, 96, 98],
	[100, 101, 99, 102],
	[104, 103, 106, 105],
	[97, 99, 98, 96],
	[101, 100, 103, 102],
	[99, 98, 100, 101],
	[102, 104, 103, 101],
	[96, 98, 97, 99]
];

describe('SPI characteristics', () => {
	it('between/within from board aggregates equals the engine on the raw pad values', () => {
		addBoards(baseline);
		const c = createCharacteristic(
			db,
			{
				name: 'Volume PB-100',
				productId: f.product.id,
				lineIds: [f.line1.id],
				measure: 'volume-pct',
				chartKind: 'between-within'
			},
			actor
		);
		const detail = chartDetail(db, c.id);
		const engine = betweenWithinChart(baseline);
		expect(detail.chart?.points).toHaveLength(10);
		expect(detail.chart?.limits.location.ucl).toBeCloseTo(engine.limits.location.ucl, 9);
		expect(detail.chart?.limits.dispersion.ucl).toBeCloseTo(engine.limits.dispersion.ucl, 9);
		expect(detail.chart?.limits.movingRange?.ucl).toBeCloseTo(
			engine.limits.movingRange?.ucl ?? NaN,
			9
		);
		expect(detail.chart?.points[0]).toMatchObject({
			label: 'FMW-00000 · SMT-1',
			key: expect.stringMatching(/^board:\d+$/)
		});
		// Capability from pooled aggregates; specs default to 50–150 % for volume.
		expect(detail.capability.result?.n).toBe(40);
		expect(detail.capability.result?.sigmaOverall).toBeCloseTo(
			sampleStandardDeviation(baseline.flat()),
			9
		);
		expect(detail.capability.histogram?.bins.reduce((a, b) => a + b.count, 0)).toBe(40);
	});

	it('a refdes selection charts those pads only', () => {
		addBoards(baseline);
		const c = createCharacteristic(
			db,
			{
				name: 'R1 R2',
				productId: f.product.id,
				measure: 'volume-pct',
				chartKind: 'xbar-r',
				padSelection: { kind: 'refdes', refdes: ['R1', 'R2'] }
			},
			actor
		);
		const detail = chartDetail(db, c.id);
		expect(detail.chart?.points.map((p) => p.location)).toEqual(
			baseline.map((b) => (b[0] + b[1]) / 2)
		);
	});

	it('evaluateSignalsAfterIngest stores a signal with its boards and mails the follower once', async () => {
		addBoards(baseline);
		const c = createCharacteristic(
			db,
			{
				name: 'Volume PB-100',
				productId: f.product.id,
				lineIds: [f.line1.id],
				measure: 'volume-pct',
				chartKind: 'between-within'
			},
			actor
		);
		setFollowing(db, c.id, f.engineer.id, true);
		freezeLimits(db, c.id, { minSubgroups: baseline.length }, actor);
		const ucl = chartDetail(db, c.id).chart!.limits.location.ucl;
		const ids = addBoards([[ucl + 5, ucl + 6, ucl + 5, ucl + 6]], 100);
		const created = await evaluateSignalsAfterIngest(db, ids);
		expect(created.some((s) => s.rule === 'we-1' && s.chartPart === 'location')).toBe(true);
		const signal = listSignals(db, { status: 'open' }).find(
			(s) => s.rule === 'we-1' && s.chartPart === 'location'
		);
		expect(signal?.boardIds).toEqual(ids);
		expect(db.select().from(mailOutbox).all()).toHaveLength(1);
		expect(await evaluateSignalsAfterIngest(db, ids)).toEqual([]);
		expect(await evaluateSignalsAfterIngest(db, [999999])).toEqual([]);
	});
});
