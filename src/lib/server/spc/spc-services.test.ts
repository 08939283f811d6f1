import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { readFileSync } from 'node:fs';
import { desc } from 'drizzle-orm';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { auditLog, mailOutbox, spcSignals } from '../db/schema';
import type { Actor } from '$lib/access';
import { addRuns, seedFactory } from './test-fixtures';
import {
	createCharacteristic,
	CharacteristicInputError,
	setFollowing,
	updateCharacteristic
} from './characteristics';
import { chartDetail } from './chart-service';
import { excludePoint, freezeLimits, LimitsError } from './limits-lifecycle';
import { acknowledgeSignal, AcknowledgeError, evaluateSignalsFor, listSignals } from './signals';
import { DIGEST_THRESHOLD, DIGEST_WINDOW_MS, flushDigests, notifyFollowers } from './signal-mail';
import { getCauseLists, setCauseList } from './cause-lists';
import { patternScopeCounts } from './ack-scope';
import { getMinBaselineSubgroups, setMinBaselineSubgroups } from './capability-settings';
import { acknowledgeBodySchema } from '$lib/spc/api-json';

// NIST/SEMATECH e-Handbook §6.3.2.2 individuals example (reference/spc/worked-examples.json).
const examples = JSON.parse(readFileSync('reference/spc/worked-examples.json', 'utf8'));
const nist = examples.nistIndividualsFlowRate as {
	values: number[];
	ucl: number;
	lcl: number;
	mean: number;
	mrUcl: number;
};

let db: Db;
let close: () => void;
let f: ReturnType<typeof seedFactory>;
let actor: Actor;
const start = new Date('2026-11-02T06:00:00Z');

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
});
afterEach(() => close());

function flowChart(extra: Record<string, unknown> = {}) {
	return createCharacteristic(
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
			...extra
		},
		actor
	);
}

describe('characteristics', () => {
	it('take defaults per measure and refuse bad input by field', () => {
		const c = createCharacteristic(
			db,
			{
				name: 'Volume',
				productId: f.product.id,
				measure: 'volume-pct',
				chartKind: 'between-within'
			},
			actor
		);
		expect([c.lsl, c.target, c.usl, c.unit]).toEqual([50, 100, 150, '%']);
		expect(c.rules).toEqual(['we-1', 'we-2', 'we-3', 'we-4']);
		const bad = [
			[{ lsl: 5, usl: 1 }, 'lsl'],
			[{ parameterKey: 'nope' }, 'parameterKey'],
			[{ chartKind: 'xbar-r' }, 'subgroupSize'],
			[{ productId: 999 }, 'productId'],
			[{ lineIds: [999] }, 'lineIds'],
			[{ name: '' }, 'name']
		] as const;
		for (const [change, field] of bad) {
			try {
				flowChart(change);
				expect.fail(`accepted ${JSON.stringify(change)}`);
			} catch (e) {
				expect(e).toBeInstanceOf(CharacteristicInputError);
				expect((e as CharacteristicInputError).problems.map((p) => p.field)).toContain(field);
			}
		}
	});

	it('update is audited with before and after', () => {
		const c = flowChart();
		updateCharacteristic(
			db,
			c.id,
			{ ...c, lineIds: c.lineIds, usl: 70, parameterKey: 'squeegeeSpeedMmS' },
			actor
		);
		const row = db.select().from(auditLog).orderBy(desc(auditLog.id)).get();
		expect(row).toMatchObject({ action: 'update', entity: 'spc-characteristic' });
		expect((row?.after as { usl: number }).usl).toBe(70);
	});
});

describe('chart of logged print parameters', () => {
	it('Phase I limits equal the NIST 6.3.2.2 individuals example', () => {
		const c = flowChart();
		addRuns(
			db,
			{ productId: f.product.id, lineId: f.line1.id, key: 'squeegeeSpeedMmS', start },
			nist.values
		);
		// Another line's runs are not part of this chart.
		addRuns(
			db,
			{ productId: f.product.id, lineId: f.line2.id, key: 'squeegeeSpeedMmS', start },
			[90, 91]
		);
		const detail = chartDetail(db, c.id);
		expect(detail.chart?.phase).toBe('I');
		expect(detail.chart?.points).toHaveLength(10);
		const limits = detail.chart!.limits;
		expect(limits.location.cl).toBeCloseTo(nist.mean, 6);
		expect(limits.location.ucl).toBeCloseTo(nist.ucl, 2);
		expect(limits.location.lcl).toBeCloseTo(nist.lcl, 2);
		expect(limits.dispersion.ucl).toBeCloseTo(nist.mrUcl, 2);
		expect(detail.chart?.violations).toEqual([]);
		expect(detail.capability.result?.cpk).toBeGreaterThan(0);
		expect(detail.capability.histogram?.bins.length).toBeGreaterThan(0);
	});

	it.each([
		[[], 'No print runs'],
		[[50], 'Not enough usable data'],
		[[50, 50, 50], 'Zero variation']
	])('%j gives a message, not a crash', (values, message) => {
		const c = flowChart();
		addRuns(
			db,
			{ productId: f.product.id, lineId: f.line1.id, key: 'squeegeeSpeedMmS', start },
			values
		);
		const detail = chartDetail(db, c.id);
		expect(detail.chart).toBeNull();
		expect(detail.message).toContain(message);
	});

	it('excluded points leave the baseline; freezing numbers versions and is audited', () => {
		const c = flowChart();
		const ids = addRuns(
			db,
			{ productId: f.product.id, lineId: f.line1.id, key: 'squeegeeSpeedMmS', start },
			[...nist.values, 80]
		);
		expect(() => excludePoint(db, c.id, `run:${ids[10]}`, ' ', actor)).toThrow(LimitsError);
		excludePoint(db, c.id, `run:${ids[10]}`, 'Squeegee blade swapped', actor);
		const detail = chartDetail(db, c.id);
		// With the outlier excluded the limits are NIST's again (its moving ranges to neighbours drop out too).
		expect(detail.chart!.limits.location.cl).toBeCloseTo(nist.mean, 6);
		expect(detail.chart!.limits.location.ucl).toBeCloseTo(nist.ucl, 2);
		expect(detail.chart!.points[10].excluded).toBe(true);
		// Issue 13: 20 subgroups by default; the NIST set has 10, so the minimum is set to 10 here.
		expect(() => freezeLimits(db, c.id, {}, actor)).toThrow(
			'The baseline has 10 subgroups (1 left out: excluded or outside the period); at least 20 are needed'
		);
		const v1 = freezeLimits(db, c.id, { note: 'first baseline', minSubgroups: 10 }, actor);
		const v2 = freezeLimits(db, c.id, { minSubgroups: 10 }, actor);
		expect([v1.version, v2.version]).toEqual([1, 2]);
		expect(v1.baselinePoints).toBe(10);
		expect(chartDetail(db, c.id).chart?.phase).toBe('II');
		const actions = db
			.select()
			.from(auditLog)
			.all()
			.map((a) => a.action);
		expect(actions).toEqual(
			expect.arrayContaining(['exclude-point', 'freeze-limits', 'recalculate-limits'])
		);
	});
});

describe('baseline minimum (site setting)', () => {
	it('the site sets how many subgroups a baseline needs; 10–200 only', () => {
		const c = flowChart();
		addRuns(
			db,
			{ productId: f.product.id, lineId: f.line1.id, key: 'squeegeeSpeedMmS', start },
			nist.values
		);
		expect(() => freezeLimits(db, c.id, {}, actor)).toThrow(LimitsError);
		expect(() => setMinBaselineSubgroups(db, 5, actor)).toThrow('whole number from 10 to 200');
		setMinBaselineSubgroups(db, 10, actor);
		expect(getMinBaselineSubgroups(db)).toBe(10);
		expect(freezeLimits(db, c.id, {}, actor).baselinePoints).toBe(10);
	});
});

describe('signals', () => {
	async function driftScenario(extra: Record<string, unknown> = {}) {
		const c = flowChart(extra);
		setFollowing(db, c.id, f.engineer.id, true);
		addRuns(
			db,
			{ productId: f.product.id, lineId: f.line1.id, key: 'squeegeeSpeedMmS', start },
			nist.values
		);
		freezeLimits(db, c.id, { minSubgroups: 10 }, actor);
		return c;
	}

	it('new data beyond the frozen UCL is stored once, as one run, with one mail', async () => {
		const c = await driftScenario();
		const later = new Date(start.getTime() + 3600_000);
		// 56 and 56.5 are above the frozen UCL 55.80 (we-1 twice: one run) and two of three beyond
		// 2σ = 54.14 (we-2 at 56.5); moving ranges 1.6, 5.5, 0.5 stay below the MR UCL 6.13.
		addRuns(
			db,
			{ productId: f.product.id, lineId: f.line1.id, key: 'squeegeeSpeedMmS', start: later },
			[50.5, 56, 56.5]
		);
		const created = await evaluateSignalsFor(db, [{ productId: f.product.id, lineId: f.line1.id }]);
		expect(created.map((s) => `${s.chartPart}:${s.rule}:${s.value}`)).toEqual([
			'location:we-1:56',
			'location:we-1:56.5',
			'location:we-2:56.5'
		]);
		expect(created[1].runId).toBe(created[0].id);
		expect(created[2].runId).toBe(created[2].id);
		const again = await evaluateSignalsFor(db, [{ productId: f.product.id, lineId: f.line1.id }]);
		expect(again).toEqual([]);
		const mails = db.select().from(mailOutbox).all();
		expect(mails).toHaveLength(1);
		expect(mails[0]).toMatchObject({ kind: 'signal', toAddresses: 'eng@fenmoor.example' });
		expect(mails[0].textBody).toContain(`/charts/${c.id}`);
		expect(mails[0].subject).toContain('2 signals');
		// Baseline points are never signals; other lines do not evaluate this chart.
		expect(await evaluateSignalsFor(db, [{ productId: f.product.id, lineId: f.line2.id }])).toEqual(
			[]
		);
	});

	it('acknowledge needs listed cause and action, records who and when, only once', async () => {
		await driftScenario();
		addRuns(
			db,
			{
				productId: f.product.id,
				lineId: f.line1.id,
				key: 'squeegeeSpeedMmS',
				start: new Date(start.getTime() + 3600_000)
			},
			[56, 56.5]
		);
		const [first] = await evaluateSignalsFor(db, [{ productId: f.product.id, lineId: f.line1.id }]);
		const lists = getCauseLists(db);
		expect(lists.actions).toEqual(
			expect.arrayContaining([
				'Wipe stencil',
				'Replenish paste',
				'Adjust pressure',
				'Replace stencil'
			])
		);
		expect(() =>
			acknowledgeSignal(db, first.id, { cause: 'Gremlins', action: 'Wipe stencil' }, actor)
		).toThrow(AcknowledgeError);
		expect(() =>
			acknowledgeSignal(db, 9999, { cause: lists.causes[0], action: 'Wipe stencil' }, actor)
		).toThrow('No signal');
		const done = acknowledgeSignal(
			db,
			first.id,
			{ cause: lists.causes[0], action: 'Wipe stencil', note: 'wiped', wholeRun: true },
			actor
		);
		expect(done).toHaveLength(2);
		expect(done[0]).toMatchObject({
			status: 'acknowledged',
			ackBy: 'Ada Engineer',
			ackAction: 'Wipe stencil'
		});
		expect(listSignals(db, { status: 'open' }).map((s) => s.rule)).toEqual(['we-2']);
		try {
			acknowledgeSignal(db, first.id, { cause: lists.causes[0], action: 'Wipe stencil' }, actor);
			expect.fail('acknowledged twice');
		} catch (e) {
			expect((e as AcknowledgeError).status).toBe(409);
		}
		setCauseList(db, 'actions', ['Wipe stencil', ' Wipe stencil ', 'Swap blade'], actor);
		expect(getCauseLists(db).actions).toEqual(['Wipe stencil', 'Swap blade']);
	});

	it('acknowledge scope: one signal by default; the pattern scope stays on the chart and its count is checked', async () => {
		const c = await driftScenario();
		addRuns(
			db,
			{
				productId: f.product.id,
				lineId: f.line1.id,
				key: 'squeegeeSpeedMmS',
				start: new Date(start.getTime() + 3600_000)
			},
			[56, 56.5]
		);
		const created = await evaluateSignalsFor(db, [{ productId: f.product.id, lineId: f.line1.id }]);
		const first = created[0];
		const lists = getCauseLists(db);
		const counts = patternScopeCounts(
			db,
			created.map((s) => s.id)
		);
		expect(counts.get(first.id)).toBe(2);
		// Another chart's signal sharing the run id (forged) is never reached by the pattern scope.
		const other = createCharacteristic(
			db,
			{
				name: 'Other side',
				productId: f.product.id,
				lineIds: [f.line1.id],
				measure: 'print-parameter',
				parameterKey: 'squeegeePressureKg',
				chartKind: 'i-mr'
			},
			actor
		);
		db.insert(spcSignals)
			.values({
				characteristicId: other.id,
				limitVersionId: first.limitVersionId,
				rule: first.rule,
				chartPart: 'location',
				pointKey: 'run:999999',
				pointKeys: ['run:999999'],
				boardIds: [],
				runId: first.runId
			})
			.run();
		expect(() =>
			acknowledgeSignal(
				db,
				first.id,
				{ cause: lists.causes[0], action: 'Wipe stencil', wholeRun: true, expectedCount: 3 },
				actor
			)
		).toThrow(/now close 2 signals, not 3/);
		const one = acknowledgeSignal(
			db,
			first.id,
			{ cause: lists.causes[0], action: 'Wipe stencil' },
			actor
		);
		expect(one.map((s) => s.id)).toEqual([first.id]);
		const second = created[1];
		const rest = acknowledgeSignal(
			db,
			second.id,
			{ cause: lists.causes[0], action: 'Wipe stencil', wholeRun: true, expectedCount: 1 },
			actor
		);
		expect(rest.map((s) => s.id)).toEqual([second.id]);
		expect(listSignals(db, { status: 'open', characteristicId: other.id })).toHaveLength(1);
		void c;
	});

	it('the acknowledge body needs a cause and an action (nothing is chosen for the person)', () => {
		expect(acknowledgeBodySchema.safeParse({ cause: '', action: 'Wipe stencil' }).success).toBe(
			false
		);
		expect(acknowledgeBodySchema.safeParse({ action: 'Wipe stencil' }).success).toBe(false);
		expect(acknowledgeBodySchema.safeParse({ cause: 'Aperture clogged' }).success).toBe(false);
		expect(
			acknowledgeBodySchema.safeParse({ cause: 'Aperture clogged', action: 'Wipe stencil' }).success
		).toBe(true);
	});

	it('many runs within the window become one digest', async () => {
		const c = await driftScenario({ rules: ['we-1'] });
		addRuns(
			db,
			{
				productId: f.product.id,
				lineId: f.line1.id,
				key: 'squeegeeSpeedMmS',
				start: new Date(start.getTime() + 3600_000)
			},
			[56, 50.8, 56, 50.8, 56, 50.8, 56, 50.8, 56]
		);
		const now = new Date();
		const stored = await evaluateSignalsFor(db, []); // nothing evaluated without scope
		expect(stored).toEqual([]);
		const { evaluateCharacteristic } = await import('./signals');
		const signals = evaluateCharacteristic(db, c);
		expect(signals).toHaveLength(5);
		expect(signals.filter((s) => s.runId === s.id)).toHaveLength(5);
		for (const s of signals.filter((s) => s.runId === s.id)) await notifyFollowers(db, [s], now);
		let mails = db.select().from(mailOutbox).all();
		expect(mails.filter((m) => m.kind === 'signal')).toHaveLength(DIGEST_THRESHOLD);
		expect(await flushDigests(db, now)).toEqual([]);
		await flushDigests(db, new Date(now.getTime() + DIGEST_WINDOW_MS));
		mails = db.select().from(mailOutbox).all();
		const digest = mails.filter((m) => m.kind === 'signal-digest');
		expect(digest).toHaveLength(1);
		expect(digest[0].subject).toContain('2 new signal runs');
	});
});
