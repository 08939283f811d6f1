import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import { ingestSpiFile } from '../ingest/ingest-service';
import { addPasteEvent } from '../printlog/paste-lots';
import { endRun, startRun } from '../printlog/print-runs';
import { seedPrintlogFixture, runPayload } from '../printlog/test-fixtures';
import { addStencilLifeEntry } from '../printlog/stencil-life';
import { spcCharacteristics, spcLimitVersions, spcSignals, mailOutbox } from '../db/schema';
import { subscribeFloorEvents, type PublishedFloorEvent } from './events';
import { eventsAfter, eventId, openStream, stopLiveOverview, DEBOUNCE_MS } from './live';
import { FACTS_MAX_AGE_MS, lineOverview } from './overview';
import {
	assignSignal,
	AssignError,
	escalateAfterMinutes,
	escalateOverdueSignals
} from './signal-owners';
import { clearCapabilityCache } from './capability-cache';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';

async function* once(text: string) {
	yield new TextEncoder().encode(text);
}

/** Boards on L1 at the given times, 2 pads each; `fail` marks boards with a failing pad. */
function spiFile(tag: string, times: number[], fail: (i: number) => boolean = () => false) {
	const rows = [HEADER];
	times.forEach((ms, i) => {
		const at = new Date(ms).toISOString();
		rows.push(`${tag}-${i},${at},L1,P1,0,C1,1,${100 + i},100,120,-2,3,pass`);
		rows.push(
			`${tag}-${i},${at},L1,P1,0,C2,1,${100 + i},100,124,2,-3,${fail(i) ? 'fail' : 'pass'}`
		);
	});
	return rows.join('\n') + '\n';
}

let t: ReturnType<typeof openTestDatabase>;
let fx: ReturnType<typeof seedPrintlogFixture>;
beforeEach(() => {
	t = openTestDatabase();
	fx = seedPrintlogFixture(t.db);
	clearCapabilityCache();
});
afterEach(() => {
	stopLiveOverview();
	t.close();
});

const tileOf = (code: string, now = Date.now()) =>
	lineOverview(t.db, now).lines.find((l) => l.lineCode === code)!;

describe('line overview from the database', () => {
	it('idle lines without a run; a started run with its stencil, paste and SPI boards', async () => {
		const before = lineOverview(t.db);
		expect(before.lines.map((l) => [l.lineCode, l.state])).toEqual([
			['L1', 'idle'],
			['L2', 'idle']
		]);
		expect(typeof before.at).toBe('string');

		const now = Date.now();
		addPasteEvent(
			t.db,
			'LOT-OK',
			{ event: 'out-of-cold-storage', at: new Date(now - 6 * 3_600_000).toISOString() },
			fx.actors.technician
		);
		addPasteEvent(
			t.db,
			'LOT-OK',
			{ event: 'opened', at: new Date(now - 2 * 3_600_000).toISOString() },
			fx.actors.technician
		);
		addPasteEvent(
			t.db,
			'LOT-OK',
			{ event: 'on-stencil', at: new Date(now - 60 * 60_000).toISOString() },
			fx.actors.technician
		);
		const run = startRun(
			t.db,
			runPayload({
				startedAt: new Date(now - 30 * 60_000).toISOString(),
				parameters: { ...runPayload().parameters, wipeIntervalPrints: 4 }
			}) as never,
			fx.actors.technician
		);
		// 10 boards in the last 5 minutes, 3 of them with a failing pad.
		const times = Array.from({ length: 10 }, (_, i) => now - (10 - i) * 30_000);
		const outcome = await ingestSpiFile(t.db, {
			source: 'api',
			fileName: 'a.csv',
			body: once(spiFile('FL', times, (i) => i >= 7)),
			createdBy: 'user:1'
		});
		expect(outcome.status).toBe('imported');

		const tile = tileOf('L1', now);
		expect(tile.state).toBe('attention');
		expect(tile.product).toEqual({ code: 'P1', name: 'Board 1' });
		// ST-GOOD's name tells no side; its approval for P1 says top.
		expect(tile.side).toBe('top');
		expect(tile.run).toMatchObject({ id: run.id, boardsPrinted: 10 });
		// The three newest boards fail: 7 of 10 pass.
		expect(tile.spi).toMatchObject({ boards: 10, passRateLast10Pct: 70, passRateLast100Pct: 70 });
		// Board means: volume 100 + i over i = 0..9 → 104.5; height (120 + 124) / 2; offsets 0.
		expect(tile.spi.volumePct).toEqual({ mean: 104.5, target: 100, boards: 10 });
		expect(tile.spi.heightUm).toEqual({ mean: 122, target: 127, boards: 10 });
		expect(tile.stencil).toMatchObject({
			name: 'ST-GOOD',
			printCount: 10,
			printsSinceClean: 10,
			lastTensionAt: null
		});
		expect(tile.paste).toMatchObject({
			lotNumber: 'LOT-OK',
			minutesOnStencil: 60,
			maxOnStencilMinutes: 480
		});
		const due = Object.fromEntries(tile.due.map((d) => [d.key, d]));
		expect(due['tension-check'].status).toBe('due');
		// 10 prints with a wipe every 4: the next in 2.
		expect(due.wipe).toMatchObject({ remainingPrints: 2 });
		expect(due['paste-on-stencil']).toMatchObject({ status: 'ok', remainingMinutes: 420 });

		addStencilLifeEntry(
			t.db,
			fx.stencilIds.good,
			{ kind: 'tension', readingsNPerCm: [40, 41, 39, 42, 40] },
			fx.actors.technician
		);
		addStencilLifeEntry(
			t.db,
			fx.stencilIds.good,
			{ kind: 'cleaning', detail: 'wet wipe, IPA' },
			fx.actors.technician
		);
		const after = tileOf('L1');
		expect(after.stencil).toMatchObject({ printsSinceClean: 0 });
		expect(after.due.find((d) => d.key === 'tension-check')!.status).toBe('ok');

		endRun(t.db, run.id, { boardsPrinted: 10 }, fx.actors.technician);
		expect(tileOf('L1')).toMatchObject({ state: 'idle', run: null });
	});
});

describe('key characteristics on the tile', () => {
	it("each active chart of the run's product and line with the capability verdict and its target", async () => {
		const { createCharacteristic } = await import('../spc/characteristics');
		const chart = createCharacteristic(
			t.db,
			{
				name: 'Paste volume · P1',
				productId: 1,
				lineIds: [],
				measure: 'volume-pct',
				chartKind: 'i-mr',
				lsl: 60,
				target: 105,
				usl: 140
			},
			fx.actors.engineer
		);
		startRun(t.db, runPayload() as never, fx.actors.technician);
		const now = Date.now();
		const times = Array.from({ length: 12 }, (_, i) => now - (12 - i) * 30_000);
		await ingestSpiFile(t.db, {
			source: 'api',
			fileName: 'c.csv',
			body: once(spiFile('CH', times)),
			createdBy: 'user:1'
		});
		const tile = tileOf('L1');
		expect(tile.characteristics).toHaveLength(1);
		const c = tile.characteristics[0];
		expect(c).toMatchObject({
			id: chart.id,
			name: 'Paste volume · P1',
			measure: 'volume-pct',
			openSignals: 0
		});
		expect(['not-stable', 'capable', 'marginal', 'not-capable', 'not-assessed']).toContain(c.level);
		// The chart's own target replaces the nominal 100 % for the volume mean.
		expect(tile.spi.volumePct.target).toBe(105);
		// L2 runs nothing: no characteristics shown.
		expect(tileOf('L2').characteristics).toEqual([]);
	});
});

describe('the facts cache', () => {
	it('re-reads a line after an event at once, after a change without an event within 30 s', () => {
		const now = Date.now();
		expect(tileOf('L1', now).lineName).toBe('Line 1');
		// A change behind the services' back (no event): the cached facts stand until they age out.
		t.db.$client.prepare(`update lines set name = 'Line one' where code = 'L1'`).run();
		expect(tileOf('L1', now + 1000).lineName).toBe('Line 1');
		expect(tileOf('L1', now + FACTS_MAX_AGE_MS + 1).lineName).toBe('Line one');
		t.db.$client.prepare(`update lines set name = 'Line uno' where code = 'L1'`).run();
		// A run started on L1 publishes an event: the next read has the new facts.
		startRun(t.db, runPayload() as never, fx.actors.technician);
		expect(tileOf('L1', now + FACTS_MAX_AGE_MS + 2)).toMatchObject({
			lineName: 'Line uno',
			run: { boardsPrinted: 0 }
		});
	});
});

describe('events and the stream', () => {
	it('services publish: run started, SPI import, paste and stencil events', async () => {
		const seen: PublishedFloorEvent[] = [];
		const stop = subscribeFloorEvents((e) => seen.push(e));
		const run = startRun(t.db, runPayload() as never, fx.actors.technician);
		await ingestSpiFile(t.db, {
			source: 'api',
			fileName: 'b.csv',
			body: once(spiFile('EV', [Date.now()])),
			createdBy: 'user:1'
		});
		addPasteEvent(t.db, 'LOT-OK', { event: 'out-of-cold-storage' }, fx.actors.technician);
		addStencilLifeEntry(
			t.db,
			fx.stencilIds.good,
			{ kind: 'cleaning', detail: 'wipe' },
			fx.actors.technician
		);
		await new Promise((r) => setTimeout(r, 0));
		stop();
		expect(seen.map((e) => e.kind)).toEqual(['run', 'spi-import', 'paste-lot', 'stencil']);
		expect(seen[0]).toMatchObject({ what: 'started', runId: run.id });
	});

	it('a burst of events on a line sends one tile; Last-Event-ID resumes after it', async () => {
		const reader = openStream(t.db, null).body!.getReader();
		const decoder = new TextDecoder();
		let text = '';
		const readUntil = async (pattern: RegExp) => {
			while (!pattern.test(text)) {
				const { value, done } = await reader.read();
				if (done) throw new Error('stream ended');
				text += decoder.decode(value);
			}
		};
		await readUntil(/event: snapshot/);
		expect(text.match(/event: line/g)).toHaveLength(2);
		text = '';
		const run = startRun(t.db, runPayload() as never, fx.actors.technician);
		addPasteEvent(t.db, 'LOT-OK', { event: 'out-of-cold-storage' }, fx.actors.technician);
		addStencilLifeEntry(
			t.db,
			fx.stencilIds.good,
			{ kind: 'cleaning', detail: 'wipe' },
			fx.actors.technician
		);
		await new Promise((r) => setTimeout(r, DEBOUNCE_MS + 100));
		await readUntil(/event: line\ndata: .*\n\n/);
		// Three events, one line, one tile.
		expect(text.match(/event: line/g)).toHaveLength(1);
		const id = /id: (\S+)\nevent: line/.exec(text)![1];
		const tile = JSON.parse(/event: line\ndata: (.*)\n/.exec(text)![1]);
		expect(tile).toMatchObject({ lineCode: 'L1', run: { id: run.id } });
		await reader.cancel();

		// A client that saw the snapshot (id before the tile) gets exactly the missed tile.
		const beforeSeq = Number(id.split('.')[1]) - 1;
		const missed = eventsAfter(eventId(beforeSeq))!;
		expect(missed.map((e) => e.event)).toEqual(['line']);
		expect(eventsAfter(id)).toEqual([]);
		// Unknown ids (another server process, garbage, the future) cannot resume.
		expect(eventsAfter('00000000.1')).toBeNull();
		expect(eventsAfter('nonsense')).toBeNull();
		expect(eventsAfter(eventId(Number(id.split('.')[1]) + 5))).toBeNull();

		const resumed = openStream(t.db, eventId(beforeSeq)).body!.getReader();
		const first = decoder.decode((await resumed.read()).value);
		expect(first).toContain(`id: ${id}\nevent: line`);
		expect(first).not.toContain('event: snapshot');
		await resumed.cancel();
	});
});

describe('signals with owners', () => {
	function seedSignal(createdAt: Date) {
		const c = t.db
			.insert(spcCharacteristics)
			.values({
				name: 'Volume C1',
				productId: 1,
				lineIds: [],
				measure: 'volume-pct',
				padSelection: { kind: 'all' },
				chartKind: 'i-mr',
				rules: ['1']
			})
			.returning()
			.get();
		const v = t.db
			.insert(spcLimitVersions)
			.values({ characteristicId: c.id, version: 1, limits: {}, baselinePoints: 20, excluded: [] })
			.returning()
			.get();
		return t.db
			.insert(spcSignals)
			.values({
				characteristicId: c.id,
				limitVersionId: v.id,
				rule: '1',
				chartPart: 'location',
				pointKey: 'board:1',
				pointKeys: ['board:1'],
				boardIds: [],
				createdAt
			})
			.returning()
			.get();
	}

	it('assigns an owner (audited), refuses unknown people and acknowledged signals', () => {
		const s = seedSignal(new Date());
		const owner = assignSignal(t.db, s.id, fx.actors.technician.id!, fx.actors.quality);
		expect(owner.assignee).toMatchObject({
			id: fx.actors.technician.kind === 'user' ? fx.actors.technician.id : 0,
			name: 'T technician'
		});
		const audit = t.db.$client
			.prepare(`select action, before, after from audit_log where action = 'assign-signal'`)
			.all();
		expect(audit).toHaveLength(1);
		expect(() => assignSignal(t.db, s.id, 9999, fx.actors.quality)).toThrow(AssignError);
		expect(() => assignSignal(t.db, 424242, null, fx.actors.quality)).toThrow(/No signal/);
		t.db.$client.prepare(`update spc_signals set ack_at = ? where id = ?`).run(Date.now(), s.id);
		expect(() => assignSignal(t.db, s.id, null, fx.actors.quality)).toThrow(/acknowledged/);
	});

	it('escalates an open signal older than the delay once, to its owner', async () => {
		const old = seedSignal(new Date(Date.now() - 90 * 60_000));
		const fresh = t.db
			.insert(spcSignals)
			.values({
				characteristicId: old.characteristicId,
				limitVersionId: old.limitVersionId,
				rule: '1',
				chartPart: 'location',
				pointKey: 'board:2',
				pointKeys: ['board:2'],
				boardIds: []
			})
			.returning()
			.get();
		assignSignal(t.db, old.id, fx.actors.technician.id!, fx.actors.quality);
		expect(await escalateOverdueSignals(t.db, 60)).toEqual([old.id]);
		expect(await escalateOverdueSignals(t.db, 60)).toEqual([]);
		const mails = t.db.select().from(mailOutbox).all();
		expect(mails).toHaveLength(1);
		expect(mails[0]).toMatchObject({
			toAddresses: 'technician@t.example',
			kind: 'signal-escalation'
		});
		expect(mails[0].textBody).toContain('Volume C1');
		const escalated = t.db.$client
			.prepare(`select id, escalated_at is not null as done from spc_signals order by id`)
			.all();
		expect(escalated).toEqual([
			{ id: old.id, done: 1 },
			{ id: fresh.id, done: 0 }
		]);
	});

	it('SIGNAL_ESCALATE_MINUTES: default 60, 0 off, a typo keeps the default', () => {
		expect(escalateAfterMinutes({})).toBe(60);
		expect(escalateAfterMinutes({ SIGNAL_ESCALATE_MINUTES: '15' })).toBe(15);
		expect(escalateAfterMinutes({ SIGNAL_ESCALATE_MINUTES: '0' })).toBe(0);
		expect(escalateAfterMinutes({ SIGNAL_ESCALATE_MINUTES: 'ten' })).toBe(60);
	});
});

describe('display tokens', () => {
	it('a viewer token in the query identifies a wall screen on the display paths only', async () => {
		const { createApiToken } = await import('../tokens');
		const { displayIdentity } = await import('./display-token');
		const viewer = createApiToken(t.db, { name: 'wall', role: 'viewer' }, fx.actors.admin).token;
		const engineer = createApiToken(t.db, { name: 'eng', role: 'engineer' }, fx.actors.admin).token;
		const q = (token: string) => new URLSearchParams({ token });
		expect(displayIdentity(t.db, '/wall', q(viewer))).toMatchObject({
			actor: { kind: 'token', role: 'viewer' }
		});
		expect(displayIdentity(t.db, '/api/lines/stream', q(viewer))).toMatchObject({
			actor: { role: 'viewer' }
		});
		expect(displayIdentity(t.db, '/api/lines/overview', q(engineer))).toEqual({
			error: 'A display token must be an API token of role viewer (read-only).'
		});
		expect(displayIdentity(t.db, '/wall', q('rb_nonsense'))).toEqual({
			error: 'The display token is malformed.'
		});
		// Elsewhere the query is ignored: the Authorization header is the only way in.
		expect(displayIdentity(t.db, '/api/print-runs', q(viewer))).toBeNull();
		expect(displayIdentity(t.db, '/wall', new URLSearchParams())).toBeNull();
	});
});
