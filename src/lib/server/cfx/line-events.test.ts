import { readFileSync } from 'node:fs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { Actor } from '$lib/access';
import type { Db } from '../db';
import { products } from '../db/schema';
import { subscribeFloorEvents, type PublishedFloorEvent } from '../floor/events';
import { linesOfEvent } from '../floor/lines-of';
import { seedPrintlogFixture } from '../printlog/test-fixtures';
import { openTestDatabase } from '../testing';
import { lineMachineEvents, saveEndpoint, storeCfxMessage } from './store';

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
const lineId = (code: string) =>
	db.$client.prepare(`select id from lines where code = ?`).pluck().get(code) as number;

beforeEach(() => {
	t = openTestDatabase();
	db = t.db;
	const { admin } = seedPrintlogFixture(db).actors as { admin: Actor };
	db.insert(products).values({ code: 'FW-CTRL-200', name: 'Controller' }).run();
	saveEndpoint(db, { handle: 'fenmoor.l1.printer', line: 'L1', kind: 'printer' }, admin);
	saveEndpoint(db, { handle: 'fenmoor.l2.printer', line: 'L2', kind: 'printer' }, admin);
});
afterEach(() => t.close());

describe("a line's machine events", () => {
	it('lists the line’s events newest first with their words, bounded, and tells the floor', async () => {
		const published: PublishedFloorEvent[] = [];
		const stop = subscribeFloorEvents((e) => published.push(e));
		try {
			const fault = ref('fault-occurred.json');
			fault.TimeStamp = '2026-12-03T07:10:00Z';
			expect((await store(fault)).status).toBe('stored');
			const cleaned = ref('stencil-cleaned.json');
			cleaned.TimeStamp = '2026-12-03T07:20:00Z';
			expect((await store(cleaned)).status).toBe('stored');
			expect(
				(
					await store({
						MessageName: 'CFX.ResourcePerformance.SolderPastePrinting.StencilChanged',
						TimeStamp: '2026-12-03T07:30:00Z',
						Source: 'fenmoor.l1.printer',
						MessageBody: { OldStencil: { Name: 'ST-GOOD' }, NewStencil: { Name: 'ST-WORN' } }
					})
				).status
			).toBe('stored');
			// Another line's event is not listed on L1.
			const other = ref('fault-occurred.json');
			other.Source = 'fenmoor.l2.printer';
			other.TimeStamp = '2026-12-03T07:40:00Z';
			expect((await store(other)).status).toBe('stored');
			await new Promise((r) => setTimeout(r, 0));

			const events = lineMachineEvents(db, lineId('L1'), 15);
			expect(events.map((e) => [e.at, e.kind, e.title, e.tone])).toEqual([
				['2026-12-03T07:30:00.000Z', 'stencil-changed', 'Stencil changed', 'info'],
				['2026-12-03T07:20:00.000Z', 'stencil-cleaned', 'Stencil cleaned', 'ok'],
				['2026-12-03T07:10:00.000Z', 'fault', 'Fault', 'fault']
			]);
			expect(events[0]).toMatchObject({
				line: 'L1',
				handle: 'fenmoor.l1.printer',
				detail: 'ST-GOOD → ST-WORN'
			});
			expect(lineMachineEvents(db, lineId('L1'), 2)).toHaveLength(2);
			expect(lineMachineEvents(db, lineId('L1'), 10_000).length).toBe(3);

			const machine = published.filter((e) => e.kind === 'machine');
			expect(machine).toHaveLength(4);
			expect(machine.map((e) => linesOfEvent(db, e))).toEqual([
				[lineId('L1')],
				[lineId('L1')],
				[lineId('L1')],
				[lineId('L2')]
			]);
		} finally {
			stop();
		}
	});
});
