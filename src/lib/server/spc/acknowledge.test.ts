import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { eq } from 'drizzle-orm';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { printRuns, productStencilApprovals, stencils } from '../db/schema';
import type { Actor } from '$lib/access';
import { addRuns, seedFactory } from './test-fixtures';
import { createCharacteristic } from './characteristics';
import { freezeLimits } from './limits-lifecycle';
import { evaluateSignalsFor, listSignals, type SignalRow } from './signals';
import { getCauseLists } from './cause-lists';
import { patternScopeCounts, patternTargets, signalSides } from './ack-scope';
import { acknowledgeFromForm, tryAcknowledge } from './acknowledge';

// NIST/SEMATECH e-Handbook §6.3.2.2 individuals example (reference/spc/worked-examples.json).
const nist = JSON.parse(readFileSync('reference/spc/worked-examples.json', 'utf8'))
	.nistIndividualsFlowRate as { values: number[] };

let db: Db;
let close: () => void;
let f: ReturnType<typeof seedFactory>;
let engineer: Actor;
const start = new Date('2026-11-02T06:00:00Z');

beforeEach(() => {
	({ db, close } = openTestDatabase());
	f = seedFactory(db);
	engineer = {
		kind: 'user',
		id: f.engineer.id,
		email: f.engineer.email,
		name: f.engineer.name,
		role: 'engineer'
	};
});
afterEach(() => close());

/** Two new runs above the frozen UCL of the squeegee-speed chart: two we-1 signals, one run. */
async function twoSignalsInOneRun(): Promise<SignalRow[]> {
	const c = createCharacteristic(
		db,
		{
			name: 'Squeegee speed SMT-1',
			productId: f.product.id,
			lineIds: [f.line1.id],
			measure: 'print-parameter',
			parameterKey: 'squeegeeSpeedMmS',
			chartKind: 'i-mr',
			lsl: 40,
			usl: 60,
			rules: ['we-1']
		},
		engineer
	);
	const at = { productId: f.product.id, lineId: f.line1.id, key: 'squeegeeSpeedMmS' };
	addRuns(db, { ...at, start }, nist.values);
	freezeLimits(db, c.id, { minSubgroups: 10 }, engineer);
	addRuns(db, { ...at, start: new Date(start.getTime() + 3600_000) }, [56, 56.5]);
	const created = await evaluateSignalsFor(db, [{ productId: f.product.id, lineId: f.line1.id }]);
	expect(created).toHaveLength(2);
	expect(created[1].runId).toBe(created[0].id);
	return created;
}

/** Print the run behind a signal's point with a stencil of this name. */
function printedWith(signal: SignalRow, name: string) {
	const stencil = db
		.insert(stencils)
		.values({ name, revision: 'A', thicknessUm: 127, technology: 'laser-stainless' })
		.returning()
		.get();
	db.update(printRuns)
		.set({ stencilId: stencil.id })
		.where(eq(printRuns.id, Number(signal.pointKey.split(':')[1])))
		.run();
}

describe('acknowledgement scope and board side (issue 13)', () => {
	it('the side of a point comes from the stencil that printed it', async () => {
		const [a, b] = await twoSignalsInOneRun();
		printedWith(a, 'ST-PB100-T');
		printedWith(b, 'ST-PB100-BOT');
		const sides = signalSides(db, [a, b, { id: 0, pointKey: 'run:999999' }]);
		expect([sides.get(a.id), sides.get(b.id), sides.get(0)]).toEqual(['top', 'bottom', null]);
	});

	it('the stencil approval for the product names the side first, as on the line tile', async () => {
		const [a, b] = await twoSignalsInOneRun();
		printedWith(a, 'ST-PB100-T');
		printedWith(b, 'ST-PB100');
		const approve = (stencilName: string, side: string) =>
			db
				.insert(productStencilApprovals)
				.values({ productId: f.product.id, stencilName, side })
				.run();
		// A name telling no side, approved for the bottom of this product: bottom.
		approve('ST-PB100', 'bottom');
		// Approved for both sides, the approval does not tell: the name does.
		approve('ST-PB100-T', 'top');
		approve('ST-PB100-T', 'bottom');
		const sides = signalSides(db, [a, b]);
		expect([sides.get(a.id), sides.get(b.id)]).toEqual(['top', 'bottom']);
		expect(patternTargets(db, a)).toEqual([a.id]);
	});

	it('a whole-run acknowledgement never closes a signal of the other board side', async () => {
		const [top, bottom] = await twoSignalsInOneRun();
		printedWith(top, 'ST-PB100-T');
		printedWith(bottom, 'ST-PB100-B');
		expect(patternScopeCounts(db, [top.id, bottom.id])).toEqual(
			new Map([
				[top.id, 1],
				[bottom.id, 1]
			])
		);
		expect(patternTargets(db, top)).toEqual([top.id]);
		const lists = getCauseLists(db);
		const done = tryAcknowledge(
			db,
			top.id,
			{ cause: lists.causes[0], action: lists.actions[0], wholeRun: true, expectedCount: 1 },
			engineer
		);
		expect(done.ok && done.signals.map((s) => s.id)).toEqual([top.id]);
		expect(listSignals(db, { status: 'open' }).map((s) => s.id)).toEqual([bottom.id]);
	});

	it('the same side, or a side not recorded, keeps the whole run in scope', async () => {
		const [a, b] = await twoSignalsInOneRun();
		expect(patternScopeCounts(db, [a.id]).get(a.id)).toBe(2);
		printedWith(a, 'ST-PB100-T');
		printedWith(b, 'ST-PB100-TOP');
		expect(patternTargets(db, a).sort()).toEqual([a.id, b.id].sort());
	});
});

describe('one acknowledge action for the signals page and the line view', () => {
	const form = (fields: Record<string, string>) => {
		const data = new FormData();
		for (const [k, v] of Object.entries(fields)) data.set(k, v);
		return data;
	};

	it('nothing chosen for the person: an empty cause or action is named, nothing stored', async () => {
		const [a] = await twoSignalsInOneRun();
		const out = acknowledgeFromForm(
			db,
			form({ id: String(a.id), cause: '', action: '' }),
			engineer
		);
		expect(out).toEqual({
			ok: false,
			status: 422,
			body: {
				action: 'acknowledge',
				id: a.id,
				field: 'cause',
				error: 'Choose the assignable cause.'
			}
		});
		expect(listSignals(db, { status: 'open' })).toHaveLength(2);
	});

	it('acknowledges with the chosen cause and action; the whole run with the count shown', async () => {
		const [a, b] = await twoSignalsInOneRun();
		const lists = getCauseLists(db);
		const fields = { id: String(a.id), cause: lists.causes[1], action: lists.actions[2] };
		const stale = acknowledgeFromForm(
			db,
			form({ ...fields, scope: 'pattern', count: '3' }),
			engineer
		);
		expect(stale).toMatchObject({ ok: false, status: 409 });
		const out = acknowledgeFromForm(
			db,
			form({ ...fields, scope: 'pattern', count: '2' }),
			engineer
		);
		expect(out).toEqual({
			ok: true,
			body: { action: 'acknowledge', id: a.id, ok: 'Acknowledged 2 signals.' }
		});
		const stored = listSignals(db, { ids: [a.id, b.id] });
		expect(stored.map((s) => [s.ackCause, s.ackAction, s.ackBy])).toEqual([
			[lists.causes[1], lists.actions[2], engineer.name],
			[lists.causes[1], lists.actions[2], engineer.name]
		]);
		const again = acknowledgeFromForm(db, form(fields), engineer);
		expect(again).toMatchObject({ ok: false, status: 409 });
	});

	it('a technician acknowledges only the open signals of the line in front of them', async () => {
		const [a, b] = await twoSignalsInOneRun();
		const technician: Actor = { ...engineer, role: 'technician' };
		const lists = getCauseLists(db);
		const onThisLine = (id: number) => id === b.id;
		const refused = acknowledgeFromForm(
			db,
			form({ id: String(a.id), cause: lists.causes[0], action: lists.actions[0] }),
			technician,
			onThisLine
		);
		expect(refused).toMatchObject({ ok: false, status: 403 });
		const done = acknowledgeFromForm(
			db,
			form({ id: String(b.id), cause: lists.causes[0], action: lists.actions[0] }),
			technician,
			onThisLine
		);
		expect(done).toMatchObject({ ok: true, body: { ok: 'Acknowledged 1 signal.' } });
		const open = listSignals(db, { ids: [a.id, b.id] }).filter((s) => s.ackAt === null);
		expect(open.map((s) => s.id)).toEqual([a.id]);
	});
});
