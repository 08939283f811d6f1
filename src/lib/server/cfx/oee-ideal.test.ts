import { readFileSync } from 'node:fs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { Actor } from '$lib/access';
import type { Db } from '../db';
import { products } from '../db/schema';
import { siteShiftSettings } from '../floor/shift-settings';
import { recipeHistory, saveRecipe } from '../printlog/recipes';
import { RECIPE_PARAMETERS, seedPrintlogFixture } from '../printlog/test-fixtures';
import { openTestDatabase } from '../testing';
import { printerOee } from './oee';
import { saveEndpoint, storeCfxMessage } from './store';

const ref = (name: string) => JSON.parse(readFileSync(`reference/cfx/${name}`, 'utf8'));
let t: ReturnType<typeof openTestDatabase>;
let db: Db;
let engineer: Actor;
let n = 0;

/** A board printed at `iso` with the printer's reported cycle time in whole seconds. */
async function printed(serial: string, iso: string, cycleS: number) {
	const env = ref('units-processed-print.json');
	env.TimeStamp = iso;
	env.MessageBody.TransactionId = `tx-${serial}`;
	env.MessageBody.UnitProcessData[0].UnitIdentifier = serial;
	env.MessageBody.UnitProcessData[0].UnitProcessData.CycleTime = `00:00:${String(cycleS).padStart(2, '0')}`;
	const out = await storeCfxMessage(db, {
		messageKey: `k${++n}`,
		body: Buffer.from(JSON.stringify(env)),
		contentEncoding: null,
		receivedAtMs: Date.now()
	});
	expect(out.status).toBe('stored');
}

beforeEach(() => {
	t = openTestDatabase();
	db = t.db;
	const actors = seedPrintlogFixture(db).actors as Record<string, Actor>;
	engineer = actors.engineer;
	db.insert(products).values({ code: 'FW-CTRL-200', name: 'Controller' }).run();
	saveEndpoint(db, { handle: 'fenmoor.l1.printer', line: 'L1', kind: 'printer' }, actors.admin);
});
afterEach(() => t.close());

describe('OEE performance: the recipe ideal, else the demonstrated best', () => {
	it("uses the printer's demonstrated best (5th percentile of its last units) and says so", async () => {
		// 40 boards a minute apart from 06:00 UTC, cycle times 20 s … 59 s.
		for (let i = 0; i < 40; i++) {
			await printed(`B${i}`, `2026-12-03T06:${String(i).padStart(2, '0')}:00Z`, 20 + i);
		}
		const [morning] = printerOee(db, { day: '2026-12-03' });
		// Run time: 06:00–06:44 (the last board at 06:39 + 5 min) = 44 min; 40 × 21 s = 14 min.
		expect(morning.runMs).toBe(44 * 60_000);
		expect(morning.performance.value).toBeCloseTo((40 * 21) / (44 * 60), 12);
		expect(morning.performance.how).toContain(
			"the printer's demonstrated best (5th percentile of the last 40 reported cycle times for FW-CTRL-200 = 21.0 s)"
		);
	});

	it("uses the recipe's ideal cycle time when it has one, kept by later versions", async () => {
		for (let i = 0; i < 4; i++) {
			await printed(`B${i}`, `2026-12-03T07:0${i}:00Z`, 30);
		}
		saveRecipe(
			db,
			{
				line: 'L1',
				product: 'FW-CTRL-200',
				idealCycleTimeS: 24,
				parameters: RECIPE_PARAMETERS
			} as Parameters<typeof saveRecipe>[1],
			engineer
		);
		// A later version saved without the field (the edit page) keeps the ideal.
		saveRecipe(
			db,
			{
				line: 'L1',
				product: 'FW-CTRL-200',
				parameters: { ...RECIPE_PARAMETERS, squeegeeAngleDeg: { min: 45, target: 55, max: 60 } }
			} as Parameters<typeof saveRecipe>[1],
			engineer
		);
		expect(recipeHistory(db, 'L1', 'FW-CTRL-200').map((r) => r.idealCycleTimeS)).toEqual([24, 24]);
		const [morning] = printerOee(db, { day: '2026-12-03' });
		// Run: 06:00–06:05 (idle after 5 min without a board) + 07:00–07:08 (last board 07:03 + 5 min)
		// = 13 min; 4 × 24 s = 96 s.
		expect(morning.runMs).toBe(13 * 60_000);
		expect(morning.performance.value).toBeCloseTo(96 / 780, 12);
		expect(morning.performance.how).toBe(
			'4 boards × ideal cycle time (from the recipe) = 1.6 min / 13.0 min run time = 12.3 %'
		);
	});
});

describe('OEE shifts on the site clock', () => {
	it('splits the day at the shift starts in the site time zone (Europe/Berlin, UTC+1 in December)', () => {
		const shifts = printerOee(db, {
			day: '2026-12-03',
			shiftStarts: ['06:00', '14:00', '22:00'],
			timeZone: 'Europe/Berlin'
		}).map((p) => p.shift);
		expect(shifts).toEqual([
			{ start: '2026-12-03T05:00:00.000Z', end: '2026-12-03T13:00:00.000Z' },
			{ start: '2026-12-03T13:00:00.000Z', end: '2026-12-03T21:00:00.000Z' },
			{ start: '2026-12-03T21:00:00.000Z', end: '2026-12-04T05:00:00.000Z' }
		]);
	});

	it('reads SHIFT_STARTS and SITE_TIME_ZONE; a malformed one stops with its name', () => {
		expect(
			siteShiftSettings({ SHIFT_STARTS: '07:00,19:00', SITE_TIME_ZONE: 'Europe/Dublin' })
		).toEqual({ starts: ['07:00', '19:00'], timeZone: 'Europe/Dublin' });
		expect(() => siteShiftSettings({ SITE_TIME_ZONE: 'Europe/Nowhere' })).toThrow(
			/^SITE_TIME_ZONE/
		);
		expect(() => siteShiftSettings({ SHIFT_STARTS: '6' })).toThrow(/^SHIFT_STARTS/);
	});
});
