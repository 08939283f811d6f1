import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { printRunSchema, pasteLotSchema } from '$lib/schemas/printlog';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { endRun, startRun } from './print-runs';
import { addPasteEvent, createPasteLot, getPasteLot, updatePasteHandling } from './paste-lots';
import { eq } from 'drizzle-orm';
import { auditLog } from '../db/schema';
import {
	addStencilLifeEntry,
	changeStencilState,
	getStencilLife,
	listStencilLife,
	recordTension,
	stencilEventLog
} from './stencil-life';
import { stencilLifeApiView } from './stencil-life-api';
import { runTrends } from './trends';
import { PrintlogRequestError } from './request-error';
import { runPayload, seedPrintlogFixture } from './test-fixtures';

let db: Db;
let close: () => void;
let fx: ReturnType<typeof seedPrintlogFixture>;
beforeEach(() => {
	({ db, close } = openTestDatabase());
	fx = seedPrintlogFixture(db);
});
afterEach(() => close());

const T0 = Date.parse('2026-03-02T08:00:00Z');

function refusal(fn: () => unknown): PrintlogRequestError {
	try {
		fn();
	} catch (error) {
		if (error instanceof PrintlogRequestError) return error;
		throw error;
	}
	throw new Error('expected a PrintlogRequestError');
}

function status(fn: () => unknown): number {
	try {
		fn();
	} catch (error) {
		if (error instanceof PrintlogRequestError) return error.status;
		throw error;
	}
	return 200;
}

describe('trends', () => {
	it('I-MR limits of the logged speeds match a hand derivation (NIST/SEMATECH §6.3.2.2)', () => {
		// Speeds 40, 44, 42: moving ranges 4 and 2, MR̄ = 3, σ̂ = MR̄/d2 with d2(2) = 2/√π
		// (first principles: mean range of two standard normals), centre 42, UCL = 42 + 3σ̂.
		const speeds = [40, 44, 42];
		speeds.forEach((speed, i) => {
			const payload = runPayload({
				parameters: { ...runPayload().parameters, squeegeeSpeedMmS: speed }
			});
			const { id } = startRun(
				db,
				printRunSchema.parse(payload),
				fx.actors.technician,
				T0 + i * 7_200_000
			);
			endRun(db, id, { boardsPrinted: 10 }, fx.actors.technician, T0 + i * 7_200_000 + 3_600_000);
		});
		const trends = runTrends(db, { line: 'L1', product: 'P1' });
		const speed = trends.parameters.find((p) => p.key === 'squeegeeSpeedMmS')!;
		expect(speed.points.map((p) => p.value)).toEqual(speeds);
		expect(speed.points.map((p) => p.movingRange)).toEqual([null, 4, 2]);
		const sigma = 3 / (2 / Math.sqrt(Math.PI));
		expect(speed.limits!.individuals.cl).toBeCloseTo(42, 12);
		expect(speed.limits!.individuals.ucl).toBeCloseTo(42 + 3 * sigma, 9);
		expect(speed.limits!.individuals.lcl).toBeCloseTo(42 - 3 * sigma, 9);
		// D4(2) = 1 + 3·d3/d2 ≈ 3.267 (Montgomery, Appendix VI).
		expect(speed.limits!.movingRange.ucl).toBeCloseTo(3.267 * 3, 2);
		expect(speed.window).toEqual({ min: 20, target: 40, max: 100 });
		expect(trends.parameters.map((p) => p.key)).not.toContain('printGapMm');
	});

	it('one run gives points but no limits; unknown codes are 422', () => {
		startRun(db, printRunSchema.parse(runPayload()), fx.actors.technician, T0);
		const angle = runTrends(db, { line: 'L1', product: 'P1' }).parameters[0];
		expect(angle.points).toHaveLength(1);
		expect(angle.limits).toBeNull();
		expect(status(() => runTrends(db, { line: 'X', product: 'P1' }))).toBe(422);
	});
});

describe('paste lots', () => {
	const lot = (extra: Record<string, unknown> = {}) =>
		pasteLotSchema.parse({
			lotNumber: 'PL-1',
			alloy: 'Sn63Pb37',
			powderType: 3,
			expiresOn: '2099-01-31',
			// A far-future expiry so the tests never age; confirmed like an odd date at receipt.
			confirmDates: true,
			...extra
		});

	it('a lot received already expired, or with an expiry years ahead, needs the dates confirmed (issue 13)', () => {
		const expired = refusal(() =>
			createPasteLot(
				db,
				lot({ lotNumber: 'PL-OLD', expiresOn: '2020-06-30', confirmDates: false }),
				fx.actors.technician,
				T0
			)
		);
		expect(expired.status).toBe(422);
		expect(expired.fields).toEqual([
			{
				field: 'expiresOn',
				message: 'the lot expired on 2020-06-30, before today (2026-03-02): it may not be used'
			}
		]);
		expect(expired.extra).toEqual({ needsConfirmation: true });
		const far = refusal(() =>
			createPasteLot(
				db,
				lot({ lotNumber: 'PL-FAR', confirmDates: false }),
				fx.actors.technician,
				T0
			)
		);
		expect(far.fields[0].message).toContain('more than 2 years ahead');
		expect(getPasteLot(db, 'PL-OLD')).toBeUndefined();
		const confirmed = createPasteLot(
			db,
			lot({ lotNumber: 'PL-OLD', expiresOn: '2020-06-30' }),
			fx.actors.technician,
			T0
		);
		expect(confirmed.lotNumber).toBe('PL-OLD');
		const plausible = createPasteLot(
			db,
			lot({
				lotNumber: 'PL-OK',
				expiresOn: '2026-08-31',
				receivedOn: '2026-03-01',
				confirmDates: false
			}),
			fx.actors.technician,
			T0
		);
		expect(plausible.expiresOn).toBe('2026-08-31');
	});

	it('keeps data-sheet handling settings, defaults the rest, flags lead and refuses duplicates', () => {
		const created = createPasteLot(db, lot({ warmUpMinutes: 120 }), fx.actors.technician, T0);
		expect(created.handling).toEqual({
			warmUpMinutes: 120,
			maxOnStencilMinutes: 480,
			maxOutOfColdMinutes: 1440
		});
		expect(created.leadBearing).toBe(true);
		expect(created.state).toBe('cold-storage');
		expect(status(() => createPasteLot(db, lot(), fx.actors.technician, T0))).toBe(409);
	});

	it('events follow the state machine; opened paste never goes back to cold storage', () => {
		createPasteLot(db, lot(), fx.actors.technician, T0);
		const open = () =>
			addPasteEvent(
				db,
				'PL-1',
				{ event: 'opened', at: '2026-03-02T07:00:00Z' },
				fx.actors.technician,
				T0
			);
		expect(status(open)).toBe(422);
		addPasteEvent(
			db,
			'PL-1',
			{ event: 'out-of-cold-storage', at: '2026-03-02T03:00:00Z' },
			fx.actors.technician,
			T0
		);
		const opened = open();
		expect(opened.warnings).toEqual([]);
		expect(opened.lot.state).toBe('opened');
		expect(
			status(() => addPasteEvent(db, 'PL-1', { event: 'returned' }, fx.actors.technician, T0))
		).toBe(422);
		expect(
			status(() => addPasteEvent(db, 'NOPE', { event: 'opened' }, fx.actors.technician, T0))
		).toBe(404);
		expect(getPasteLot(db, 'pl-1')!.events.map((e) => e.event)).toEqual([
			'out-of-cold-storage',
			'opened'
		]);
	});

	it('opening before the 4 h warm-up is allowed with a warning', () => {
		createPasteLot(db, lot(), fx.actors.technician, T0);
		addPasteEvent(
			db,
			'PL-1',
			{ event: 'out-of-cold-storage', at: '2026-03-02T06:00:00Z' },
			fx.actors.technician,
			T0
		);
		const { warnings } = addPasteEvent(
			db,
			'PL-1',
			{ event: 'opened', at: '2026-03-02T07:00:00Z' },
			fx.actors.technician,
			T0
		);
		expect(warnings[0]).toContain('opened after 1 h out of cold storage; the warm-up time is 4 h');
	});
});

describe('stencil life', () => {
	it('state changes are logged; only an engineer releases a quarantined stencil', () => {
		const id = fx.stencilIds.quarantined;
		expect(
			status(() => changeStencilState(db, id, { toState: 'available' }, fx.actors.technician))
		).toBe(422);
		changeStencilState(db, id, { toState: 'available', note: 'inspected' }, fx.actors.engineer);
		expect(getStencilLife(db, id)!.state).toBe('available');
		expect(
			status(() => changeStencilState(db, id, { toState: 'quarantined' }, fx.actors.technician))
		).toBe(422);
		expect(stencilEventLog(db, id)[0]).toMatchObject({
			kind: 'state',
			fromState: 'quarantined',
			toState: 'available'
		});
	});

	it('tension readings: implausible ones are refused, low ones kept and reported (35 N/cm default)', () => {
		const id = fx.stencilIds.good;
		expect(
			status(() => recordTension(db, id, { readingsNPerCm: [38, 350] }, fx.actors.technician))
		).toBe(422);
		const check = recordTension(db, id, { readingsNPerCm: [38, 34.5, 40] }, fx.actors.technician);
		expect(check.low).toEqual([{ index: 1, valueNPerCm: 34.5 }]);
		expect(getStencilLife(db, id)!.lastTension).toMatchObject({ minimumNPerCm: 34.5, pass: false });
	});
});

describe('stencil life entries (the API service)', () => {
	it('stores each kind, returns the entry and audits it', () => {
		const id = fx.stencilIds.good;
		const at = new Date('2026-03-02T09:00:00Z');
		const tension = addStencilLifeEntry(
			db,
			id,
			{ kind: 'tension', readingsNPerCm: [38, 34.5, 40], note: 'after 5000 prints', at },
			fx.actors.technician
		);
		expect(tension.entry).toMatchObject({
			stencilId: id,
			kind: 'tension',
			at,
			readingsNPerCm: [38, 34.5, 40],
			note: 'after 5000 prints',
			by: 'T technician'
		});
		// Mean by hand: (38 + 34.5 + 40) / 3 = 37.5 N/cm; 34.5 is under the 35 N/cm minimum.
		expect(tension.tension).toMatchObject({ meanNPerCm: 37.5, minimumNPerCm: 34.5, pass: false });
		const cleaning = addStencilLifeEntry(
			db,
			id,
			{ kind: 'cleaning', detail: 'ultrasonic, water-based cleaner' },
			fx.actors.technician
		);
		expect(cleaning.entry).toMatchObject({
			kind: 'cleaning',
			detail: 'ultrasonic, water-based cleaner'
		});
		const state = addStencilLifeEntry(
			db,
			id,
			{ kind: 'state', toState: 'quarantined', note: 'dent near U7' },
			fx.actors.technician
		);
		expect(state.entry).toMatchObject({
			kind: 'state',
			fromState: 'available',
			toState: 'quarantined'
		});
		expect(state.stencil.state).toBe('quarantined');
		const actions = db
			.select({ action: auditLog.action })
			.from(auditLog)
			.where(eq(auditLog.entity, 'stencil'))
			.all()
			.map((a) => a.action);
		expect(actions).toEqual(['tension', 'cleaning', 'state']);
	});

	it('404 for an unknown stencil, 422 for the same rules as the page', () => {
		expect(
			status(() =>
				addStencilLifeEntry(db, 9999, { kind: 'cleaning', detail: 'x' }, fx.actors.admin)
			)
		).toBe(404);
		const hold = fx.stencilIds.quarantined;
		expect(
			status(() =>
				addStencilLifeEntry(db, hold, { kind: 'state', toState: 'available' }, fx.actors.technician)
			)
		).toBe(422);
		expect(
			status(() =>
				addStencilLifeEntry(
					db,
					hold,
					{ kind: 'tension', readingsNPerCm: [0] },
					fx.actors.technician
				)
			)
		).toBe(422);
		expect(
			status(() =>
				addStencilLifeEntry(db, hold, { kind: 'inspection', detail: ' ' }, fx.actors.technician)
			)
		).toBe(422);
		expect(stencilEventLog(db, hold)).toEqual([]);
	});

	it('the API view gives print count, rated life, share used, state and latest tension', () => {
		const { id: runId } = startRun(
			db,
			printRunSchema.parse(runPayload({ stencil: 'ST-WORN' })),
			fx.actors.technician,
			T0
		);
		endRun(db, runId, { boardsPrinted: 90 }, fx.actors.technician, T0 + 60_000);
		recordTension(
			db,
			fx.stencilIds.worn,
			{ readingsNPerCm: [36, 37], at: new Date(T0) },
			fx.actors.technician
		);
		const worn = listStencilLife(db)
			.map(stencilLifeApiView)
			.find((s) => s.name === 'ST-WORN')!;
		// 90 of 100 rated prints = 90 %, the warning threshold.
		expect(worn).toMatchObject({
			state: 'in-use',
			printCount: 90,
			ratedLifePrints: 100,
			lifeUsedPct: 90,
			nearLife: true,
			latestTension: {
				at: '2026-03-02T08:00:00.000Z',
				readingsNPerCm: [36, 37],
				minimumNPerCm: 36,
				meanNPerCm: 36.5,
				pass: true
			},
			forRun: { refuse: null, warn: expect.stringContaining('90 %') }
		});
	});
});

describe('paste handling settings', () => {
	it('are changed to the data sheet figures and audited; implausible ones are named', () => {
		createPasteLot(
			db,
			pasteLotSchema.parse({
				lotNumber: 'PL-2',
				alloy: 'SAC305',
				powderType: 4,
				expiresOn: '2099-01-31',
				confirmDates: true
			}),
			fx.actors.technician,
			T0
		);
		const lot = updatePasteHandling(
			db,
			'PL-2',
			{ warmUpMinutes: 120, maxOnStencilMinutes: undefined },
			fx.actors.engineer,
			T0
		);
		expect(lot.handling).toEqual({
			warmUpMinutes: 120,
			maxOnStencilMinutes: 480,
			maxOutOfColdMinutes: 1440
		});
		let fields: string[] = [];
		try {
			updatePasteHandling(db, 'PL-2', { maxOutOfColdMinutes: 60 }, fx.actors.engineer, T0);
		} catch (error) {
			fields = (error as PrintlogRequestError).fields.map((f) => f.field);
		}
		// Warm-up (120 min) must stay shorter than the time allowed out of cold storage.
		expect(fields).toEqual(['warmUpMinutes']);
		expect(getPasteLot(db, 'PL-2')!.handling.maxOutOfColdMinutes).toBe(1440);
	});
});
