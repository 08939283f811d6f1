import { readFileSync } from 'node:fs';
import { gzipSync } from 'node:zlib';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { Actor } from '$lib/access';
import type { Db } from '../db';
import { products, stencils } from '../db/schema';
import { seedPrintlogFixture } from '../printlog/test-fixtures';
import { openTestDatabase } from '../testing';
import {
	assignPendingInspection,
	cfxCounts,
	cfxMessageKey,
	discardQuarantined,
	listPendingInspections,
	listQuarantine,
	pruneReceivedIds,
	recentLineEvents,
	retryQuarantined,
	saveEndpoint,
	storeCfxMessage
} from './store';

// Messages written from the CFX SDK's definitions (reference/cfx/README.md).
const ref = (name: string) => JSON.parse(readFileSync(`reference/cfx/${name}`, 'utf8'));

let t: ReturnType<typeof openTestDatabase>;
let db: Db;
let admin: Actor;
let n = 0;

function msg(body: unknown, key = `m${++n}`) {
	return { messageKey: key, body, contentEncoding: null, receivedAtMs: Date.now() };
}

/** An envelope of the reference file with its Source and body product names replaced. */
// Fixtures edit arbitrary nested fields of parsed reference JSON.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
function envelope(file: string, change: (env: Record<string, any>) => void = () => {}) {
	const env = ref(file);
	change(env);
	return Buffer.from(JSON.stringify(env));
}

const count = (sql: string, ...args: unknown[]) =>
	db.$client
		.prepare(sql)
		.pluck()
		.get(...args) as number;

beforeEach(() => {
	t = openTestDatabase();
	db = t.db;
	({ admin } = seedPrintlogFixture(db).actors as { admin: Actor });
	db.insert(products).values({ code: 'FW-CTRL-200', name: 'Controller' }).run();
	db.insert(stencils)
		.values({
			name: 'ST-CTRL-200-A',
			revision: 'A',
			thicknessUm: 120,
			technology: 'laser-stainless',
			state: 'in-use',
			ratedLifePrints: 50000
		})
		.run();
	saveEndpoint(db, { handle: 'fenmoor.l1.printer', line: 'L1', kind: 'printer' }, admin);
	saveEndpoint(db, { handle: 'fenmoor.l1.spi', line: 'l1', kind: 'inspection' }, admin);
});

afterEach(() => t.close());

describe('storeCfxMessage', () => {
	it('a printer line without typing: work, print parameters, run opened by recipe name, boards counted', async () => {
		expect(await storeCfxMessage(db, msg(envelope('work-started.json')))).toMatchObject({
			status: 'stored'
		});
		expect(await storeCfxMessage(db, msg(envelope('units-processed-print.json')))).toMatchObject({
			status: 'stored'
		});
		const run = db.$client
			.prepare(`select * from print_runs where ended_at is null`)
			.get() as Record<string, unknown>;
		expect(run).toMatchObject({
			boards_printed: 0,
			started_at: Date.parse('2026-12-03T07:15:52.500Z')
		});
		expect(JSON.parse(run.warnings as string)[0]).toBe(
			'opened from CFX messages of fenmoor.l1.printer'
		);
		const unit = db.$client
			.prepare(
				`select * from cfx_units where unit_identifier = 'FW-PNL-000101' and position_number = 1`
			)
			.get() as Record<string, unknown>;
		expect(unit).toMatchObject({
			print_run_id: run.id,
			cycle_time_ms: 22_500,
			recipe_name: 'FW-CTRL-200'
		});
		expect(JSON.parse(unit.parameters as string)).toMatchObject({
			squeegeePressureKg: 6.5,
			squeegeeSpeedMmS: 45
		});
		// The two positions of the panel: work started both, one printed so far.
		expect(count(`select count(*) from cfx_units`)).toBe(2);
		const completed = envelope('work-started.json', (e) => {
			e.MessageName = 'CFX.Production.WorkCompleted';
			e.TimeStamp = '2026-12-03T07:16:00Z';
			e.MessageBody.Result = 'Completed';
		});
		await storeCfxMessage(db, msg(completed));
		// The unit of position 2 was not on a run at WorkStarted (no run yet): only position 1 counts.
		expect(count(`select boards_printed from print_runs where id = ?`, run.id)).toBe(1);
		expect(count(`select count(*) from cfx_units where completed_at is not null`)).toBe(2);
	});

	it('checks print parameters against the recipe window of the run’s product', async () => {
		// P1 has a recipe on L1 (squeegee speed window 20–100 mm/s, printlog test fixture).
		const body = envelope('units-processed-print.json', (e) => {
			e.MessageBody.UnitProcessData[0].UnitProcessData.RecipeName = 'P1';
			e.MessageBody.UnitProcessData[0].UnitProcessData.Strokes[0].PrintSpeed = 150; // window 20–100
		});
		await storeCfxMessage(db, msg(body));
		const deviations = JSON.parse(count(`select deviations from cfx_units`) as unknown as string);
		// The recipe strokes 'alternating'; the printer reported FirstPrintDirection 'backward'.
		expect(deviations).toEqual([
			expect.objectContaining({ parameter: 'squeegeeSpeedMmS', value: 150, min: 20, max: 100 }),
			expect.objectContaining({
				parameter: 'printStroke',
				value: 'back-to-front',
				expected: 'alternating'
			})
		]);
	});

	it('SPI measurements go through the SPI ingest (gzip body, both places read), with the run linked', async () => {
		await storeCfxMessage(db, msg(envelope('units-processed-print.json')));
		const runId = count(`select id from print_runs`);
		const out = await storeCfxMessage(db, msg(gzipSync(envelope('units-inspected-spi.json'))));
		expect(out).toMatchObject({ status: 'stored' });
		const board = db.$client.prepare(`select * from spi_boards`).get() as Record<string, unknown>;
		expect(board).toMatchObject({
			serial: 'FW-PNL-000101',
			line_code: 'L1',
			product_code: 'FW-CTRL-200',
			print_run_id: runId,
			pad_count: 3,
			pass_count: 2,
			fail_count: 1
		});
		// Volume % from millilitres: (96 + 100 + 48) / 3 (reference/cfx/README.md).
		expect(board.volume_pct_mean as number).toBeCloseTo(244 / 3, 6);
		expect(count(`select source from spi_imports`) as unknown).toBe('cfx');
	});

	it('a redelivered message (same id) is stored once', async () => {
		const body = envelope('work-started.json');
		expect((await storeCfxMessage(db, msg(body, 'same'))).status).toBe('stored');
		expect((await storeCfxMessage(db, msg(body, 'same'))).status).toBe('duplicate');
		expect(count(`select count(*) from cfx_units`)).toBe(2);
		expect(cfxMessageKey('abc', null)).toBe('id:abc');
		expect(cfxMessageKey(undefined, Buffer.from('x'))).toBe(
			'sha256:2d711642b726b04401627ca9fbac32f5c8530fb1903cc4db02258717921a4881'
		);
	});

	it('forgets settled ids older than the window, never held ones', async () => {
		await storeCfxMessage(db, {
			...msg(envelope('work-started.json'), 'old'),
			receivedAtMs: 1_000
		});
		await storeCfxMessage(db, { ...msg(Buffer.from('nope'), 'old-bad'), receivedAtMs: 1_000 });
		await storeCfxMessage(db, msg(envelope('fault-occurred.json'), 'new'));
		expect(pruneReceivedIds(db, 2_000)).toBe(1);
		expect(
			db.$client.prepare(`select message_key from cfx_messages order by message_key`).pluck().all()
		).toEqual(['new', 'old-bad']);
	});

	it('an unmapped handle is quarantined, then stored once mapped and retried', async () => {
		const body = envelope('fault-occurred.json', (e) => (e.Source = 'fenmoor.l2.printer'));
		const out = await storeCfxMessage(db, msg(body, 'q1'));
		expect(out).toEqual({
			status: 'quarantined',
			reason:
				'handle "fenmoor.l2.printer" is not mapped to a line (add it under Admin → Machine messages)'
		});
		expect(listQuarantine(db)).toMatchObject([
			{ messageKey: 'q1', handle: 'fenmoor.l2.printer', status: 'held' }
		]);
		// A redelivery of the held message is not held twice.
		expect((await storeCfxMessage(db, msg(body, 'q1'))).status).toBe('duplicate');
		const id = listQuarantine(db)[0].id;
		saveEndpoint(db, { handle: 'fenmoor.l2.printer', line: 'L2', kind: 'printer' }, admin);
		expect((await retryQuarantined(db, id)).status).toBe('stored');
		expect(listQuarantine(db)).toEqual([]);
		expect(recentLineEvents(db, null)).toMatchObject([
			{ line: 'L2', kind: 'fault', detail: { code: 'ERR-PASTE-LOW' } }
		]);
		expect(cfxCounts(db)).toMatchObject({ stored: 1, quarantined: 0 });
	});

	it('hostile and malformed messages are quarantined with reasons; nothing else is written', async () => {
		const bad = [
			Buffer.from('{"MessageName":'),
			gzipSync(Buffer.alloc(20 * 1024 * 1024, 32)),
			Buffer.from(JSON.stringify([ref('work-started.json'), { MessageName: 'X' }])),
			envelope(
				'units-inspected-spi.json',
				(e) => (e.MessageBody.InspectedUnits[0].Inspections[0].Measurements[0].Vol = 'lots')
			)
		];
		const reasons = [];
		for (const body of bad) {
			const out = await storeCfxMessage(db, msg(body));
			expect(out.status).toBe('quarantined');
			reasons.push(out.status === 'quarantined' && out.reason);
		}
		expect(reasons[0]).toMatch(/^body is not JSON/);
		expect(reasons[1]).toMatch(/inflates beyond/);
		expect(reasons[2]).toBe("envelope 2: X: envelope has no Source (the sender's CFX handle)");
		expect(reasons[3]).toMatch(/Measurements\[0\] \(R1\.1\): Vol and EVol must be numbers$/);
		const impossible = await storeCfxMessage(
			db,
			msg(
				envelope(
					'units-processed-print.json',
					(e) => (e.MessageBody.UnitProcessData[0].UnitProcessData.Strokes[0].PrintSpeed = 0)
				)
			)
		);
		expect(impossible.status === 'quarantined' && impossible.reason).toMatch(
			/^CFX\.Production\.Processing\.UnitsProcessed: unit FW-PNL-000101: squeegeeSpeedMmS must be > 0/
		);
		expect(count(`select count(*) from cfx_units`) + count(`select count(*) from spi_boards`)).toBe(
			0
		);
		expect(count(`select count(*) from print_runs`)).toBe(0);
		expect(cfxCounts(db).quarantined).toBe(5);
		discardQuarantined(db, listQuarantine(db)[0].id, admin);
		expect(cfxCounts(db).quarantined).toBe(4);
	});

	it('SPI values the ingest refuses quarantine the message with the ingest’s words', async () => {
		await storeCfxMessage(db, msg(envelope('units-processed-print.json')));
		// Z of 5 mm = 5000 µm, outside the canonical 0–2000 µm range.
		const body = envelope(
			'units-inspected-spi.json',
			(e) => (e.MessageBody.InspectedUnits[0].Inspections[0].Measurements[0].Z = 5)
		);
		const out = await storeCfxMessage(db, msg(body));
		expect(out.status).toBe('quarantined');
		expect(out.status === 'quarantined' && out.reason).toMatch(
			/^SPI ingest refused the measurements \(1 error\(s\)\): row 2, column "height_um"/
		);
		expect(count(`select count(*) from spi_boards`)).toBe(0);
	});

	it('a unit whose product cannot be told is held for assignment, then ingested', async () => {
		const body = envelope(
			'units-inspected-spi.json',
			(e) => (e.MessageBody.RecipeName = 'NOT-A-PRODUCT')
		);
		expect((await storeCfxMessage(db, msg(body))).status).toBe('stored');
		expect(count(`select count(*) from spi_boards`)).toBe(0);
		const pending = listPendingInspections(db);
		expect(pending).toMatchObject([
			{ line: 'L1', unitIdentifier: 'FW-PNL-000101', padCount: 3, recipeName: 'NOT-A-PRODUCT' }
		]);
		const assigned = await assignPendingInspection(db, pending[0].id, 'fw-ctrl-200', admin);
		expect(assigned.status).toBe('imported');
		expect(count(`select count(*) from spi_boards where product_code = 'FW-CTRL-200'`)).toBe(1);
		expect(listPendingInspections(db)).toEqual([]);
	});

	it('stencil cleaning reaches the stencil’s life log; a stencil change ends a CFX-opened run', async () => {
		await storeCfxMessage(db, msg(envelope('stencil-cleaned.json')));
		expect(db.$client.prepare(`select kind, detail, actor from stencil_events`).all()).toEqual([
			{ kind: 'cleaning', detail: 'printer clean, mode V', actor: 'cfx:fenmoor.l1.printer' }
		]);
		const change = (at: string, name: string) =>
			Buffer.from(
				JSON.stringify({
					MessageName: 'CFX.ResourcePerformance.SolderPastePrinting.StencilChanged',
					TimeStamp: at,
					Source: 'fenmoor.l1.printer',
					MessageBody: { OldStencil: null, NewStencil: { Name: name } }
				})
			);
		await storeCfxMessage(db, msg(change('2026-12-03T07:00:00Z', 'ST-CTRL-200-A')));
		await storeCfxMessage(db, msg(envelope('units-processed-print.json')));
		expect(
			db.$client
				.prepare(`select s.name from print_runs r join stencils s on s.id = r.stencil_id`)
				.pluck()
				.get()
		).toBe('ST-CTRL-200-A');
		await storeCfxMessage(db, msg(change('2026-12-03T08:00:00Z', 'ST-GOOD')));
		expect(count(`select ended_at from print_runs`)).toBe(Date.parse('2026-12-03T08:00:00Z'));
	});
});
