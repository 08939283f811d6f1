import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { printRunSchema } from '$lib/schemas/printlog';
import { productFitSchema } from '$lib/schemas/product-fit';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { auditLog, printRuns, products, stencils } from '../db/schema';
import { productByCode } from './lookups';
import { createPasteLot } from './paste-lots';
import { getRun, startRun } from './print-runs';
import { getProductFit, setProductFit } from './product-fit';
import { PrintlogRequestError } from './request-error';
import { runPayload, seedPrintlogFixture } from './test-fixtures';

let db: Db;
let close: () => void;
let fx: ReturnType<typeof seedPrintlogFixture>;
let p1: number;
beforeEach(() => {
	({ db, close } = openTestDatabase());
	fx = seedPrintlogFixture(db);
	p1 = productByCode(db, 'P1')!.id;
	db.insert(stencils)
		.values({ name: 'ST-OTHER', revision: 'A', thicknessUm: 100, technology: 'laser-stainless' })
		.run();
	createPasteLot(
		db,
		{
			lotNumber: 'LOT-BI',
			alloy: 'Sn42Bi58',
			powderType: 5,
			expiresOn: '2099-12-31',
			confirmDates: true
		},
		fx.actors.technician
	);
});
afterEach(() => close());

const T0 = Date.parse('2026-03-02T08:00:00Z');
const parse = (overrides: Record<string, unknown> = {}) =>
	printRunSchema.parse(runPayload(overrides));
const runCount = () =>
	db
		.select({ n: sql<number>`count(*)` })
		.from(printRuns)
		.get()!.n;

function refusal(fn: () => unknown): PrintlogRequestError {
	try {
		fn();
	} catch (error) {
		if (error instanceof PrintlogRequestError) return error;
		throw error;
	}
	throw new Error('expected a PrintlogRequestError');
}

describe('setting a product fit', () => {
	it('replaces the rules, collapses duplicates, keeps stencil names as labelled, audits before and after', () => {
		const view = setProductFit(
			db,
			p1,
			productFitSchema.parse({
				approvals: [
					{ stencil: 'st-good', side: 'top' },
					{ stencil: 'ST-GOOD', side: 'top' },
					{ stencil: 'ST-OTHER', side: 'bottom' }
				],
				alloys: ['SAC305', 'sac 305'],
				powderTypes: [4, 4, 5]
			}),
			fx.actors.engineer
		);
		expect(view).toMatchObject({
			product: 'P1',
			approvals: [
				{ stencilName: 'ST-GOOD', side: 'top' },
				{ stencilName: 'ST-OTHER', side: 'bottom' }
			],
			alloys: ['sac 305'],
			powderTypes: [4, 5]
		});
		const audit = db.select().from(auditLog).where(eq(auditLog.action, 'set-fit')).all();
		expect(audit).toHaveLength(2); // the fixture's and this one
		expect(audit[1].before).toMatchObject({ alloys: ['SAC305', 'Sn63Pb37'] });
		expect(audit[1].after).toMatchObject({ powderTypes: [4, 5] });
		expect(audit[1].actor).toBe(`user:${fx.actors.engineer.id}`);
	});

	it('an unknown stencil is refused by its index with suggestions, nothing written; an unknown product is 404', () => {
		const error = refusal(() =>
			setProductFit(
				db,
				p1,
				{ approvals: [{ stencil: 'ST-GOD', side: 'top' }], alloys: [], powderTypes: [] },
				fx.actors.engineer
			)
		);
		expect(error.status).toBe(422);
		expect(error.fields).toEqual([
			{ field: 'approvals[0].stencil', message: expect.stringContaining('did you mean ST-GOOD') }
		]);
		expect(getProductFit(db, p1).approvals).toHaveLength(3);
		expect(refusal(() => getProductFit(db, 9999)).status).toBe(404);
	});

	it('the body schema bounds powder types and alloy text', () => {
		const bad = productFitSchema.safeParse({
			approvals: [],
			alloys: ['=cmd|x'],
			powderTypes: [9]
		});
		expect(bad.success).toBe(false);
		expect(bad.error!.issues.map((i) => i.path.join('.'))).toEqual(['alloys.0', 'powderTypes.0']);
	});
});

describe('starting a run checks stencil, paste and product', () => {
	it('a stencil not approved for the product: 422 on the stencil naming the reason, nothing saved', () => {
		const error = refusal(() =>
			startRun(db, parse({ stencil: 'ST-OTHER' }), fx.actors.technician, T0)
		);
		expect(error.status).toBe(422);
		expect(error.fields).toEqual([
			{
				field: 'stencil',
				message:
					'stencil ST-OTHER is not approved for P1 (approved: ST-GOOD (top), ST-HOLD (top), ST-WORN (top)) (an engineer can override with a reason)'
			}
		]);
		expect(error.body()).toMatchObject({
			refusals: [{ field: 'stencil', reason: 'stencil-not-approved' }]
		});
		expect(runCount()).toBe(0);
	});

	it('a paste alloy and powder type the product does not allow: 422 on the paste lot, both reasons', () => {
		const error = refusal(() =>
			startRun(db, parse({ pasteLot: 'LOT-BI' }), fx.actors.technician, T0)
		);
		expect(error.fields.map((f) => f.field)).toEqual(['pasteLot', 'pasteLot']);
		expect(error.body().refusals).toEqual([
			expect.objectContaining({ reason: 'alloy-not-allowed' }),
			expect.objectContaining({ reason: 'powder-type-not-allowed' })
		]);
		expect(error.fields[0].message).toContain('LOT-BI is Sn42Bi58');
	});

	it('a technician may not override: the note itself is refused too', () => {
		const error = refusal(() =>
			startRun(db, parse({ stencil: 'ST-OTHER', overrideReason: 'rush' }), fx.actors.technician, T0)
		);
		expect(error.fields.map((f) => f.field).sort()).toEqual(['overrideReason', 'stencil']);
		expect(runCount()).toBe(0);
	});

	it("an engineer's note overrides: the run is saved with the note and warnings, and the override is audited", () => {
		const started = startRun(
			db,
			parse({ stencil: 'ST-OTHER', pasteLot: 'LOT-BI', overrideReason: 'trial build, 20 boards' }),
			fx.actors.engineer,
			T0
		);
		const run = getRun(db, started.id)!;
		expect(run.overrideReason).toBe('trial build, 20 boards');
		const overridden = run.warnings.filter((w) =>
			w.endsWith("; used on the engineer's override: trial build, 20 boards")
		);
		expect(overridden).toHaveLength(3);
		expect(overridden[0]).toMatch(
			/^stencil ST-OTHER is not approved for P1 .*; used on the engineer's override: trial build, 20 boards$/
		);
		const audit = db
			.select()
			.from(auditLog)
			.where(eq(auditLog.action, 'override-product-fit'))
			.all();
		expect(audit).toHaveLength(1);
		expect(audit[0]).toMatchObject({
			entity: 'print_run',
			entityId: String(started.id),
			actor: `user:${fx.actors.engineer.id}`
		});
		expect(audit[0].after).toMatchObject({
			note: 'trial build, 20 boards',
			product: 'P1',
			refusals: [
				{ reason: 'stencil-not-approved' },
				{ reason: 'alloy-not-allowed' },
				{ reason: 'powder-type-not-allowed' }
			]
		});
	});

	it('a product with no rules yet is not refused: the run says what was not checked', () => {
		db.insert(products).values({ code: 'P2', name: 'Board 2' }).run();
		const started = startRun(
			db,
			parse({ product: 'P2', stencil: 'ST-OTHER', pasteLot: 'LOT-BI' }),
			fx.actors.technician,
			T0
		);
		expect(started.warnings).toEqual(
			expect.arrayContaining([
				'no stencil is approved for P2 yet: the stencil was not checked',
				'P2 names no allowed alloy yet: the paste alloy was not checked',
				'P2 names no allowed powder type yet: the powder type was not checked'
			])
		);
		expect(
			db.select().from(auditLog).where(eq(auditLog.action, 'override-product-fit')).all()
		).toHaveLength(0);
	});
});
