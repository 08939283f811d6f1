import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { printRunSchema, recipeSchema } from '$lib/schemas/printlog';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { auditLog, printRuns, spiBoards, spiImports } from '../db/schema';
import { PrintlogRequestError } from './request-error';
import { correctRun, endRun, getRun, listRuns, runsToCsv, startRun } from './print-runs';
import { recipeHistory, saveRecipe } from './recipes';
import { getStencilLife } from './stencil-life';
import { addPasteEvent, createPasteLot } from './paste-lots';
import { RECIPE_PARAMETERS, runPayload, seedPrintlogFixture } from './test-fixtures';

let db: Db;
let close: () => void;
let fx: ReturnType<typeof seedPrintlogFixture>;
beforeEach(() => {
	({ db, close } = openTestDatabase());
	fx = seedPrintlogFixture(db);
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

/** Run `fn`, expecting a PrintlogRequestError; return it. */
function refusal(fn: () => unknown): PrintlogRequestError {
	try {
		fn();
	} catch (error) {
		if (error instanceof PrintlogRequestError) return error;
		throw error;
	}
	throw new Error('expected a PrintlogRequestError');
}

describe('recipes', () => {
	it('an edit makes the next version, audited with before and after; identical is refused', () => {
		const changed = {
			...RECIPE_PARAMETERS,
			squeegeeSpeedMmS: { min: 25, target: 50, max: 80 }
		};
		const v2 = saveRecipe(
			db,
			recipeSchema.parse({ line: 'L1', product: 'P1', parameters: changed }),
			fx.actors.engineer
		);
		expect(v2.version).toBe(2);
		expect(recipeHistory(db, 'L1', 'P1').map((r) => r.version)).toEqual([2, 1]);
		const audit = db.select().from(auditLog).where(eq(auditLog.action, 'new-version')).all();
		expect(audit).toHaveLength(1);
		expect(audit[0].before).toMatchObject({ version: 1 });
		expect(audit[0].after).toMatchObject({ version: 2 });
		expect(audit[0].actor).toBe(`user:${fx.actors.engineer.id}`);
		const same = refusal(() =>
			saveRecipe(db, recipeSchema.parse({ line: 'L1', product: 'P1', parameters: changed }), null)
		);
		expect(same.status).toBe(409);
	});

	it('unknown line or product codes are named', () => {
		const error = refusal(() =>
			saveRecipe(
				db,
				recipeSchema.parse({ line: 'NOPE', product: 'P1', parameters: RECIPE_PARAMETERS }),
				null
			)
		);
		expect(error.status).toBe(422);
		expect(error.fields.map((f) => f.field)).toEqual(['line']);
	});
});

describe('starting a run', () => {
	it('saves a run on target with its recipe version, operator and no deviations', () => {
		const started = startRun(db, parse(), fx.actors.technician, T0);
		expect(started.deviations).toEqual([]);
		const run = getRun(db, started.id)!;
		expect(run).toMatchObject({
			line: 'L1',
			product: 'P1',
			stencil: 'ST-GOOD',
			pasteLot: 'LOT-OK'
		});
		expect(run.recipeVersion).toBe(1);
		expect(run.operator).toBe('T technician');
		expect(run.startedAt.getTime()).toBe(T0);
		expect(run.endedAt).toBeNull();
	});

	it('a deviation without a reason is 422 naming the parameter, and nothing is saved', () => {
		const error = refusal(() =>
			startRun(
				db,
				parse({ parameters: { ...runPayload().parameters, squeegeeAngleDeg: 65 } }),
				fx.actors.technician,
				T0
			)
		);
		expect(error.status).toBe(422);
		expect(error.body()).toMatchObject({
			parameters: ['squeegeeAngleDeg'],
			deviations: [{ parameter: 'squeegeeAngleDeg', value: 65, min: 45, max: 60 }]
		});
		expect(error.fields[0].field).toBe('deviationReasons.squeegeeAngleDeg');
		expect(runCount()).toBe(0);
	});

	it('with the reason the run is saved and keeps its deviation and reason', () => {
		const started = startRun(
			db,
			parse({
				parameters: { ...runPayload().parameters, squeegeeAngleDeg: 65 },
				deviationReasons: { squeegeeAngleDeg: 'new blade holder' }
			}),
			fx.actors.technician,
			T0
		);
		expect(started.deviations).toEqual([
			{ parameter: 'squeegeeAngleDeg', value: 65, min: 45, max: 60 }
		]);
		expect(getRun(db, started.id)!.deviations[0]).toMatchObject({ reason: 'new blade holder' });
	});

	it('the window edges are inside (45° and 60° need no reason)', () => {
		for (const angle of [45, 60]) {
			const started = startRun(
				db,
				parse({
					line: angle === 45 ? 'L1' : 'L2',
					parameters: { ...runPayload().parameters, squeegeeAngleDeg: angle }
				}),
				fx.actors.technician,
				T0
			);
			expect(started.deviations).toEqual([]);
		}
	});

	it('ambient out of the 20–26 °C common-practice window is recorded without needing a reason', () => {
		const started = startRun(db, parse({ ambientTempC: 28 }), fx.actors.technician, T0);
		expect(started.deviations).toEqual([
			{ parameter: 'ambientTempC', value: 28, min: 20, max: 26 }
		]);
	});

	it('refuses an expired lot and an unknown stencil code (with a suggestion) together', () => {
		const error = refusal(() =>
			startRun(db, parse({ pasteLot: 'LOT-OLD', stencil: 'ST-GOD' }), fx.actors.technician, T0)
		);
		expect(error.status).toBe(422);
		const byField = Object.fromEntries(error.fields.map((f) => [f.field, f.message]));
		expect(byField.pasteLot).toContain('expired');
		expect(byField.stencil).toContain('did you mean ST-GOOD');
		expect(runCount()).toBe(0);
	});

	it('an expired lot blocks the run; an engineer may use it with a note, kept on the run (issue 13)', () => {
		const tech = refusal(() =>
			startRun(db, parse({ pasteLot: 'LOT-OLD', overrideReason: 'rush' }), fx.actors.technician, T0)
		);
		expect(tech.fields.map((f) => f.field).sort()).toEqual(['overrideReason', 'pasteLot']);
		expect(runCount()).toBe(0);
		const started = startRun(
			db,
			parse({ pasteLot: 'LOT-OLD', overrideReason: 'viscosity re-tested in spec, QA ok' }),
			fx.actors.engineer,
			T0
		);
		const run = getRun(db, started.id)!;
		expect(run.overrideReason).toBe('viscosity re-tested in spec, QA ok');
		expect(started.warnings.join(' ')).toContain(
			"expired (expiry 2020-01-31); used on the engineer's override"
		);
	});

	it('a lot past its time on the stencil blocks the run with the reason', () => {
		addPasteEvent(
			db,
			'LOT-OK',
			{ event: 'out-of-cold-storage', at: '2026-03-01T08:00:00Z' },
			fx.actors.technician,
			T0
		);
		addPasteEvent(
			db,
			'LOT-OK',
			{ event: 'opened', at: '2026-03-01T12:00:00Z' },
			fx.actors.technician,
			T0
		);
		addPasteEvent(
			db,
			'LOT-OK',
			{ event: 'on-stencil', at: '2026-03-01T12:05:00Z' },
			fx.actors.technician,
			T0
		);
		const error = refusal(() => startRun(db, parse(), fx.actors.technician, T0));
		expect(error.fields).toEqual([
			{
				field: 'pasteLot',
				message: expect.stringContaining(
					'has been on the stencil for 19 h 55 min, over the 8 h limit'
				)
			}
		]);
	});

	it('warns about a lot still warming up (4 h common-practice default)', () => {
		addPasteEvent(
			db,
			'LOT-OK',
			{ event: 'out-of-cold-storage', at: '2026-03-02T07:00:00Z' },
			fx.actors.technician,
			T0
		);
		const started = startRun(db, parse(), fx.actors.technician, T0);
		expect(started.warnings.join(' ')).toContain('still warming up: 1 h of 4 h');
	});

	it('a quarantined stencil is refused; a technician may not override; an engineer may, with a reason', () => {
		const plain = refusal(() =>
			startRun(db, parse({ stencil: 'ST-HOLD' }), fx.actors.technician, T0)
		);
		expect(plain.fields).toEqual([
			{ field: 'stencil', message: expect.stringContaining('quarantined') }
		]);
		const tech = refusal(() =>
			startRun(db, parse({ stencil: 'ST-HOLD', overrideReason: 'rush' }), fx.actors.technician, T0)
		);
		expect(tech.fields.map((f) => f.field).sort()).toEqual(['overrideReason', 'stencil']);
		const started = startRun(
			db,
			parse({ stencil: 'ST-HOLD', overrideReason: 'tension re-checked, 38 N/cm' }),
			fx.actors.engineer,
			T0
		);
		const run = getRun(db, started.id)!;
		expect(run.overrideReason).toBe('tension re-checked, 38 N/cm');
		expect(started.warnings.join(' ')).toContain('overridden');
	});

	it('stencil life: warned from 90 % of rated life, refused at 100 % (print count = boards of its runs)', () => {
		const first = startRun(
			db,
			parse({ stencil: 'ST-WORN', boardsPrinted: 90 }),
			fx.actors.technician,
			T0
		);
		endRun(db, first.id, {}, fx.actors.technician, T0 + 60_000);
		expect(getStencilLife(db, fx.stencilIds.worn)).toMatchObject({
			printCount: 90,
			lifeUsedPct: 90
		});
		const second = startRun(
			db,
			parse({ stencil: 'ST-WORN', boardsPrinted: 10 }),
			fx.actors.technician,
			T0 + 120_000
		);
		expect(second.warnings.join(' ')).toContain('90 % of its rated life (90 of 100 prints)');
		endRun(db, second.id, {}, fx.actors.technician, T0 + 180_000);
		const third = refusal(() =>
			startRun(db, parse({ stencil: 'ST-WORN' }), fx.actors.technician, T0 + 240_000)
		);
		expect(third.fields[0].message).toContain('reached its rated life (100 of 100 prints)');
	});

	it('a second open run on the same line is 409; another line is fine', () => {
		startRun(db, parse(), fx.actors.technician, T0);
		const clash = refusal(() => startRun(db, parse(), fx.actors.technician, T0 + 1000));
		expect(clash.status).toBe(409);
		expect(clash.fields[0]).toMatchObject({
			field: 'line',
			message: expect.stringContaining('already has an open run')
		});
		expect(() => startRun(db, parse({ line: 'L2' }), fx.actors.technician, T0)).not.toThrow();
		expect(runCount()).toBe(2);
	});
});

describe('ending and correcting', () => {
	it('an end before the start is refused; a later end closes the run and frees the line', () => {
		const { id } = startRun(db, parse(), fx.actors.technician, T0);
		const early = refusal(() =>
			endRun(db, id, { endedAt: '2026-03-02T07:00:00Z' }, fx.actors.technician)
		);
		expect(early.status).toBe(422);
		expect(early.fields[0].field).toBe('endedAt');
		const ended = endRun(db, id, { boardsPrinted: 120 }, fx.actors.technician, T0 + 3_600_000);
		expect(ended.boardsPrinted).toBe(120);
		expect(refusal(() => endRun(db, id, {}, fx.actors.technician)).status).toBe(409);
		expect(() => startRun(db, parse(), fx.actors.technician, T0 + 4_000_000)).not.toThrow();
	});

	it('a correction is re-checked, counted and audited with before, after and reason', () => {
		const { id } = startRun(db, parse(), fx.actors.technician, T0);
		const noReason = refusal(() =>
			correctRun(
				db,
				id,
				{ reason: 'typo', parameters: { squeegeeSpeedMmS: 120 } },
				fx.actors.technician
			)
		);
		expect(noReason.fields.map((f) => f.field)).toEqual(['deviationReasons.squeegeeSpeedMmS']);
		const corrected = correctRun(
			db,
			id,
			{
				reason: 'typed 40, printer showed 120',
				parameters: { squeegeeSpeedMmS: 120 },
				deviationReasons: { squeegeeSpeedMmS: 'trial for fine pitch' }
			},
			fx.actors.technician
		);
		expect(corrected.parameters.squeegeeSpeedMmS).toBe(120);
		expect(corrected.corrections).toBe(1);
		const audit = db.select().from(auditLog).where(eq(auditLog.action, 'correct')).get()!;
		expect(
			(audit.before as { parameters: Record<string, number> }).parameters.squeegeeSpeedMmS
		).toBe(40);
		expect(audit.after).toMatchObject({ correctionReason: 'typed 40, printer showed 120' });
	});
});

describe('board serial and corrections of every field', () => {
	it('a run keeps the scanned board serial (cleaned, case kept) and shows it in the CSV', () => {
		const { id } = startRun(
			db,
			parse({ boardSerial: ']C1Fw-P1-000123\r' }),
			fx.actors.technician,
			T0
		);
		expect(getRun(db, id)!.boardSerial).toBe('Fw-P1-000123');
		const [header, row] = runsToCsv(listRuns(db), []).split('\r\n');
		const column = header.split(',').indexOf('boardSerial');
		expect(column).toBeGreaterThan(0);
		expect(row.split(',')[column]).toBe('Fw-P1-000123');
		const bad = printRunSchema.safeParse(runPayload({ boardSerial: 'FW\u00071' }));
		expect(bad.error?.issues[0]).toMatchObject({ path: ['boardSerial'] });
	});

	it('warns when SPI inspected the serial as another product (exact serial, newest inspection)', () => {
		const importId = db
			.insert(spiImports)
			.values({
				source: 'api',
				fileName: 'fw.csv',
				sha256: 'a'.repeat(64),
				sizeBytes: 1,
				status: 'imported',
				createdBy: 'test',
				startedAt: new Date(T0),
				finishedAt: new Date(T0)
			})
			.returning({ id: spiImports.id })
			.get().id;
		const board = (serial: string, productCode: string, at: number) => ({
			serial,
			inspectedAt: new Date(at),
			lineCode: 'L1',
			productCode,
			importId,
			padCount: 1,
			passCount: 1,
			warnCount: 0,
			failCount: 0
		});
		db.insert(spiBoards)
			.values([
				board('FW-X-1', 'P1', T0 - 2000),
				board('FW-X-1', 'P9', T0 - 1000),
				board('FW-X-2', 'p1', T0 - 1000)
			])
			.run();
		const other = startRun(db, parse({ boardSerial: 'FW-X-1' }), fx.actors.technician, T0);
		expect(other.warnings).toContain(
			`board FW-X-1 was inspected as product P9 (SPI, ${new Date(T0 - 1000).toISOString()}), not P1: check the product and the label`
		);
		const same = startRun(
			db,
			parse({ line: 'L2', boardSerial: 'FW-X-2' }),
			fx.actors.technician,
			T0
		);
		expect(same.warnings.filter((w) => w.includes('SPI'))).toEqual([]);
		// A different case is a different serial: SPI quotes serials exactly.
		endRun(db, other.id, {}, fx.actors.technician, T0 + 1000);
		const unseen = startRun(db, parse({ boardSerial: 'fw-x-1' }), fx.actors.technician, T0 + 2000);
		expect(unseen.warnings.filter((w) => w.includes('SPI'))).toEqual([]);
	});

	it('stencil, lot, blade, serial, times, ambient and categorical settings are corrected and audited', () => {
		const { id } = startRun(db, parse({ ambientTempC: 23 }), fx.actors.technician, T0);
		endRun(db, id, { boardsPrinted: 50 }, fx.actors.technician, T0 + 3_600_000);
		createPasteLot(
			db,
			{
				lotNumber: 'LOT-TWO',
				alloy: 'SAC305',
				powderType: 4,
				expiresOn: '2099-12-31',
				confirmDates: true
			},
			fx.actors.technician
		);
		const corrected = correctRun(
			db,
			id,
			{
				reason: 'wrong items scanned at the start',
				stencil: 'st-worn',
				pasteLot: 'lot-two',
				bladeCode: 'BL-300-07',
				boardSerial: 'FW-P1-000124',
				startedAt: '2026-03-02T07:30:00Z',
				endedAt: '2026-03-02T09:30:00Z',
				ambientTempC: null,
				parameters: { printStroke: 'front-to-back' },
				deviationReasons: { printStroke: 'worn stencil prints better one way' }
			},
			fx.actors.engineer
		);
		expect(corrected).toMatchObject({
			stencil: 'ST-WORN',
			pasteLot: 'LOT-TWO',
			bladeCode: 'BL-300-07',
			boardSerial: 'FW-P1-000124',
			ambientTempC: null,
			corrections: 1
		});
		expect(corrected.startedAt.toISOString()).toBe('2026-03-02T07:30:00.000Z');
		expect(corrected.deviations).toEqual([
			expect.objectContaining({
				parameter: 'printStroke',
				reason: 'worn stencil prints better one way'
			})
		]);
		// The boards move with the run: the print count follows the corrected stencil.
		expect(getStencilLife(db, fx.stencilIds.worn)!.printCount).toBe(50);
		expect(getStencilLife(db, fx.stencilIds.good)!.printCount).toBe(0);
		const audit = db.select().from(auditLog).where(eq(auditLog.action, 'correct')).get()!;
		expect(audit.before).toMatchObject({
			stencil: 'ST-GOOD',
			pasteLot: 'LOT-OK',
			boardSerial: null
		});
		expect(audit.after).toMatchObject({ stencil: 'ST-WORN', boardSerial: 'FW-P1-000124' });
	});

	it('refuses unknown codes, an expired lot, a bad serial, an end before the start and a no-op', () => {
		const { id } = startRun(db, parse(), fx.actors.technician, T0);
		const before = getRun(db, id)!;
		const bad = refusal(() =>
			correctRun(
				db,
				id,
				{
					reason: 'fix',
					stencil: 'ST-GOD',
					pasteLot: 'LOT-OLD',
					boardSerial: 'FW\u00071',
					endedAt: '2026-03-02T07:00:00Z'
				},
				fx.actors.technician
			)
		);
		expect(bad.status).toBe(422);
		expect(bad.fields.map((f) => f.field)).toEqual([
			'endedAt',
			'stencil',
			'pasteLot',
			'boardSerial'
		]);
		expect(bad.fields[1].message).toContain('did you mean ST-GOOD');
		expect(bad.fields[2].message).toContain('expired');
		const noop = refusal(() =>
			correctRun(
				db,
				id,
				{ reason: 'nothing', stencil: 'st-good', bladeCode: null },
				fx.actors.technician
			)
		);
		expect(noop.fields[0].message).toContain('nothing to correct');
		expect(getRun(db, id)).toEqual(before);
		expect(db.select().from(auditLog).where(eq(auditLog.action, 'correct')).all()).toHaveLength(0);
	});
});

describe('listing and CSV', () => {
	it('filters by line, lot and date; CSV quotes commas and neutralises formulas', () => {
		const a = startRun(
			db,
			parse({
				bladeCode: '=HYPERLINK("x")',
				parameters: { ...runPayload().parameters, squeegeeAngleDeg: 65 },
				deviationReasons: { squeegeeAngleDeg: 'a, b' }
			}),
			fx.actors.technician,
			T0
		);
		startRun(db, parse({ line: 'L2' }), fx.actors.technician, T0 + 86_400_000);
		expect(listRuns(db, { line: 'L1' }).map((r) => r.id)).toEqual([a.id]);
		expect(listRuns(db, { lot: 'lot-ok' })).toHaveLength(2);
		expect(listRuns(db, { to: new Date(T0 + 1000) })).toHaveLength(1);
		expect(listRuns(db, { line: 'unknown' })).toEqual([]);
		const csv = runsToCsv(listRuns(db, { line: 'L1' }), ['squeegeeAngleDeg']);
		const [header, row] = csv.split('\r\n');
		expect(header.split(',')).toContain('squeegeeAngleDeg');
		expect(row).toContain(`"'=HYPERLINK(""x"")"`);
		expect(row).toContain('"squeegeeAngleDeg=65 (a, b)"');
	});
});
