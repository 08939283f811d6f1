import { readFileSync } from 'node:fs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { Actor } from '$lib/access';
import type { Db } from '../db';
import { products } from '../db/schema';
import { seedPrintlogFixture } from '../printlog/test-fixtures';
import { openTestDatabase } from '../testing';
import { lineChangeovers, printerOee, shiftsOfDay } from './oee';
import { saveEndpoint, storeCfxMessage } from './store';

const ref = (name: string) => JSON.parse(readFileSync(`reference/cfx/${name}`, 'utf8'));
let t: ReturnType<typeof openTestDatabase>;
let db: Db;
let n = 0;
const store = (env: unknown) =>
	storeCfxMessage(db, {
		messageKey: `k${++n}`,
		body: Buffer.from(JSON.stringify(env)),
		contentEncoding: null,
		receivedAtMs: Date.now()
	});
const at = (hhmm: string) => `2026-12-03T${hhmm}:00Z`;

function printed(serial: string, time: string) {
	const env = ref('units-processed-print.json');
	env.TimeStamp = at(time);
	env.MessageBody.TransactionId = `tx-${serial}`;
	env.MessageBody.UnitProcessData[0].UnitIdentifier = serial;
	return env;
}

beforeEach(() => {
	t = openTestDatabase();
	db = t.db;
	const { admin } = seedPrintlogFixture(db).actors as { admin: Actor };
	db.insert(products).values({ code: 'FW-CTRL-200', name: 'Controller' }).run();
	saveEndpoint(db, { handle: 'fenmoor.l1.printer', line: 'L1', kind: 'printer' }, admin);
	saveEndpoint(db, { handle: 'fenmoor.l1.spi', line: 'L1', kind: 'inspection' }, admin);
});
afterEach(() => t.close());

describe('printer OEE and changeovers from stored messages', () => {
	it('computes each factor from the messages of the shift (figures worked by hand)', async () => {
		for (const [serial, time] of [
			['B1', '07:00'],
			['B2', '07:01'],
			['B3', '07:02'],
			['B4', '07:30']
		]) {
			expect((await store(printed(serial, time))).status).toBe('stored');
		}
		const fault = ref('fault-occurred.json');
		fault.TimeStamp = at('07:10');
		await store(fault);
		await store({
			MessageName: 'CFX.ResourcePerformance.FaultCleared',
			TimeStamp: at('07:20'),
			Source: 'fenmoor.l1.printer',
			MessageBody: { FaultOccurrenceId: fault.MessageBody.Fault.FaultOccurrenceId }
		});
		await store({
			MessageName: 'CFX.ResourcePerformance.SolderPastePrinting.StencilChanged',
			TimeStamp: at('07:05'),
			Source: 'fenmoor.l1.printer',
			MessageBody: { OldStencil: { Name: 'ST-GOOD' }, NewStencil: { Name: 'ST-WORN' } }
		});
		// B1 fails its first SPI inspection (U3.7 of the reference message); B2 passes.
		const failing = ref('units-inspected-spi.json');
		failing.MessageBody.InspectedUnits[0].UnitIdentifier = 'B1';
		const passing = ref('units-inspected-spi.json');
		passing.TimeStamp = at('07:03');
		passing.MessageBody.InspectedUnits[0].UnitIdentifier = 'B2';
		passing.MessageBody.InspectedUnits[0].Inspections[0].DefectsFound = [];
		expect((await store(failing)).status).toBe('stored');
		expect((await store(passing)).status).toBe('stored');

		const [morning, afternoon] = printerOee(db, { day: '2026-12-03' });
		expect(morning.shift).toEqual({
			start: '2026-12-03T06:00:00.000Z',
			end: '2026-12-03T14:00:00.000Z'
		});
		// Boards at minutes 60, 61, 62, 90 of the shift; idle beyond 5 min: 5–60, 67–90, 95–480
		// = 55 + 23 + 385 = 463 min, the fault (70–80) inside it; run time 17 min.
		expect(morning).toMatchObject({
			boards: 4,
			faultMs: 10 * 60_000,
			unavailableMs: 463 * 60_000,
			runMs: 17 * 60_000,
			inspected: 2,
			firstPassed: 1
		});
		expect(morning.availability.value).toBeCloseTo(17 / 480, 12);
		// 4 boards × 22.5 s (the demonstrated best: every reported cycle time is 22.5 s) / 17 min.
		expect(morning.performance.value).toBeCloseTo(90 / (17 * 60), 12);
		expect(morning.quality.value).toBe(0.5);
		expect(morning.oee.value).toBeCloseTo((17 / 480) * (90 / 1020) * 0.5, 12);
		// No board in the afternoon: idle from 5 min after its start to its end.
		expect(afternoon).toMatchObject({ boards: 0, runMs: 5 * 60_000, performance: { value: null } });

		// Stencil change at 07:05: last board 07:02, first after 07:30.
		const changes = lineChangeovers(db, {
			fromMs: Date.parse(at('00:00')),
			toMs: Date.parse(at('23:59'))
		});
		expect(changes).toEqual([
			expect.objectContaining({
				line: 'L1',
				kind: 'stencil',
				from: 'ST-GOOD',
				to: 'ST-WORN',
				durationMs: 28 * 60_000
			})
		]);
	});

	it('splits a day into shifts at their starts, the last one running into the next day', () => {
		expect(
			shiftsOfDay('2026-12-03', ['22:00', '06:00', '14:00']).map((s) => [
				new Date(s.startMs).toISOString(),
				new Date(s.endMs).toISOString()
			])
		).toEqual([
			['2026-12-03T06:00:00.000Z', '2026-12-03T14:00:00.000Z'],
			['2026-12-03T14:00:00.000Z', '2026-12-03T22:00:00.000Z'],
			['2026-12-03T22:00:00.000Z', '2026-12-04T06:00:00.000Z']
		]);
	});
});
