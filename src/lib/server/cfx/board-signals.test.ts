import { readFileSync } from 'node:fs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { Actor } from '$lib/access';
import type { Db } from '../db';
import { printRuns } from '../db/schema';
import { subscribeFloorEvents, type PublishedFloorEvent } from '../floor/events';
import { openSignalsByLine } from '../floor/facts';
import { linesOfEvent } from '../floor/lines-of';
import { seedPrintlogFixture } from '../printlog/test-fixtures';
import { createCharacteristic } from '../spc/characteristics';
import { chartDetail } from '../spc/chart-service';
import { freezeLimits } from '../spc/limits-lifecycle';
import { listSignals } from '../spc/signals';
import { addRuns } from '../spc/test-fixtures';
import { openTestDatabase } from '../testing';
import { saveEndpoint, storeCfxMessage } from './store';

const ref = (name: string) => JSON.parse(readFileSync(`reference/cfx/${name}`, 'utf8'));
let t: ReturnType<typeof openTestDatabase>;
let db: Db;
let engineer: Actor;
let n = 0;
let ids: { line: number; product: number };

/** The printer reports one board printed at `iso` with this squeegee speed (mm/s). */
async function printed(serial: string, iso: string, speedMmS: number) {
	const env = ref('units-processed-print.json');
	env.TimeStamp = iso;
	env.MessageBody.TransactionId = `tx-${serial}`;
	const unit = env.MessageBody.UnitProcessData[0];
	unit.UnitIdentifier = serial;
	for (const stroke of unit.UnitProcessData.Strokes) stroke.PrintSpeed = speedMmS;
	return storeCfxMessage(db, {
		messageKey: `k${++n}`,
		body: Buffer.from(JSON.stringify(env)),
		contentEncoding: null,
		receivedAtMs: Date.now()
	});
}

beforeEach(() => {
	t = openTestDatabase();
	db = t.db;
	const actors = seedPrintlogFixture(db).actors as Record<string, Actor>;
	engineer = actors.engineer;
	saveEndpoint(db, { handle: 'fenmoor.l1.printer', line: 'L1', kind: 'printer' }, actors.admin);
	const one = (sql: string) => db.$client.prepare(sql).pluck().get() as number;
	ids = {
		line: one(`select id from lines where code = 'L1'`),
		product: one(`select id from products where code = 'P1'`)
	};
	// 20 typed runs at 38–42 mm/s (the recipe window is 20–100), limits frozen on them.
	const speeds = [40, 41, 39, 40, 42, 38, 40, 41, 39, 40, 40, 41, 39, 40, 42, 38, 40, 41, 39, 40];
	addRuns(
		db,
		{
			productId: ids.product,
			lineId: ids.line,
			key: 'squeegeeSpeedMmS',
			start: new Date('2026-11-02T06:00:00Z')
		},
		speeds
	);
	// A run open on the line, at the recipe's target: the printer's boards belong to it.
	db.insert(printRuns)
		.values({
			productId: ids.product,
			lineId: ids.line,
			parameters: { squeegeeSpeedMmS: 40 },
			startedAt: new Date('2026-11-02T07:00:00Z')
		})
		.run();
});
afterEach(() => t.close());

describe('boards printed outside the recipe window raise signals like print runs', () => {
	it('a deviating board is a chart point, judged by the rules, signalled on its line', async () => {
		const chart = createCharacteristic(
			db,
			{
				name: 'Squeegee speed L1',
				productId: ids.product,
				lineIds: [ids.line],
				measure: 'print-parameter',
				parameterKey: 'squeegeeSpeedMmS',
				chartKind: 'i-mr'
			},
			engineer
		);
		freezeLimits(db, chart.id, {}, engineer);
		const published: PublishedFloorEvent[] = [];
		const stop = subscribeFloorEvents((e) => published.push(e));
		try {
			// Inside the window: recorded with the board, no chart point, no signal.
			expect((await printed('B-IN', '2026-11-02T07:10:00Z', 45)).status).toBe('stored');
			expect(listSignals(db, { characteristicId: chart.id })).toHaveLength(0);
			// 150 mm/s is outside the window (20–100): the board becomes a point and signals (rule 1).
			expect((await printed('B-OUT', '2026-11-02T07:20:00Z', 150)).status).toBe('stored');
			await new Promise((r) => setTimeout(r, 0));
		} finally {
			stop();
		}
		const unitId = db.$client
			.prepare(`select id from cfx_units where unit_identifier = 'B-OUT'`)
			.pluck()
			.get() as number;
		const stored = db.$client
			.prepare(`select deviations from cfx_units where id = ?`)
			.pluck()
			.get(unitId) as string;
		expect(JSON.parse(stored)).toContainEqual(
			expect.objectContaining({ parameter: 'squeegeeSpeedMmS', value: 150, min: 20, max: 100 })
		);
		const signals = listSignals(db, { characteristicId: chart.id });
		expect(signals.map((s) => [s.rule, s.chartPart, s.pointKey, s.value])).toContainEqual([
			'we-1',
			'location',
			`cfx-unit:${unitId}`,
			150
		]);
		const points = chartDetail(db, chart.id).chart!.points;
		expect(points.at(-1)).toMatchObject({ key: `cfx-unit:${unitId}` });
		expect(points.filter((p) => p.key?.startsWith('cfx-unit:'))).toHaveLength(1);
		// The floor hears of it, on the board's line (the tile and the line view show it).
		const raised = published.filter((e) => e.kind === 'signal' && e.what === 'raised');
		expect(raised).toHaveLength(1);
		expect(linesOfEvent(db, raised[0])).toEqual([ids.line]);
		// The line view and its tile list it on the line, with the run the board belongs to.
		const openRun = db.$client
			.prepare(`select id from print_runs where ended_at is null`)
			.pluck()
			.get() as number;
		expect(openSignalsByLine(db).get(ids.line)).toContainEqual(
			expect.objectContaining({ pointKey: `cfx-unit:${unitId}`, printRunId: openRun })
		);
	});

	it('without a chart of the parameter the deviation stays recorded with the board only', async () => {
		expect((await printed('B-OUT', '2026-11-02T07:20:00Z', 150)).status).toBe('stored');
		expect(listSignals(db, {})).toHaveLength(0);
	});
});
