import { asc, desc, eq, sql } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import {
	assessStencilForRun,
	checkTensionReadings,
	STENCIL_LIFE_WARN_PCT,
	stencilTransitionProblem,
	type StencilAssessment,
	type StencilState,
	type TensionCheck
} from '$lib/printlog';
import { actorLabel, recordAudit } from '../audit';
import type { Db } from '../db';
import { printRuns, stencilEvents, stencils, users } from '../db/schema';
import { listStencilRefs, type StencilRef } from './lookups';
import { PrintlogRequestError } from './request-error';
import { publishFloorEvent } from '../floor/events';

/** A stencil with its accumulated print count and life figures. */
export type StencilLife = StencilRef & {
	printCount: number;
	/** printCount / ratedLifePrints × 100, or null without a rated life. */
	lifeUsedPct: number | null;
	/** True from 90 % of rated life. */
	nearLife: boolean;
	lastTension: {
		at: Date;
		readingsNPerCm: number[];
		minimumNPerCm: number;
		meanNPerCm: number;
		pass: boolean;
	} | null;
};

/** One entry of a stencil's life log. */
export type StencilEventView = {
	id: number;
	kind: 'state' | 'tension' | 'cleaning' | 'inspection';
	at: Date;
	fromState: string | null;
	toState: string | null;
	readingsNPerCm: number[] | null;
	detail: string;
	note: string;
	by: string | null;
};

/** Print count per stencil id: the boards printed by every run on it. */
export function printCounts(db: Db): Map<number, number> {
	const rows = db
		.select({
			stencilId: printRuns.stencilId,
			prints: sql<number>`coalesce(sum(${printRuns.boardsPrinted}), 0)`
		})
		.from(printRuns)
		.groupBy(printRuns.stencilId)
		.all();
	return new Map(rows.filter((r) => r.stencilId !== null).map((r) => [r.stencilId!, r.prints]));
}

function lastTensions(db: Db): Map<number, StencilLife['lastTension']> {
	const rows = db
		.select({
			stencilId: stencilEvents.stencilId,
			at: stencilEvents.at,
			readings: stencilEvents.readingsNPerCm
		})
		.from(stencilEvents)
		.where(eq(stencilEvents.kind, 'tension'))
		.orderBy(asc(stencilEvents.at), asc(stencilEvents.id))
		.all();
	const map = new Map<number, StencilLife['lastTension']>();
	for (const row of rows) {
		const check = checkTensionReadings(row.readings ?? []);
		if (check.minimumNPerCm === null) continue;
		map.set(row.stencilId, {
			at: row.at,
			readingsNPerCm: row.readings ?? [],
			minimumNPerCm: check.minimumNPerCm,
			meanNPerCm: check.meanNPerCm!,
			pass: check.pass
		});
	}
	return map;
}

function withLife(
	ref: StencilRef,
	counts: Map<number, number>,
	tensions: Map<number, StencilLife['lastTension']>
): StencilLife {
	const printCount = counts.get(ref.id) ?? 0;
	const lifeUsedPct = ref.ratedLifePrints ? (printCount / ref.ratedLifePrints) * 100 : null;
	return {
		...ref,
		printCount,
		lifeUsedPct,
		nearLife: lifeUsedPct !== null && lifeUsedPct >= STENCIL_LIFE_WARN_PCT,
		lastTension: tensions.get(ref.id) ?? null
	};
}

/** Every stencil with its life figures, by name. */
export function listStencilLife(db: Db): StencilLife[] {
	const counts = printCounts(db);
	const tensions = lastTensions(db);
	return listStencilRefs(db).map((ref) => withLife(ref, counts, tensions));
}

/** One stencil's life figures, or undefined. */
export function getStencilLife(db: Db, id: number): StencilLife | undefined {
	return listStencilLife(db).find((s) => s.id === id);
}

/** What a run on this stencil would be told (warning at 90 %, refusal past life or quarantined). */
export function assessStencil(
	life: StencilLife,
	overrideReason?: string | null
): StencilAssessment {
	return assessStencilForRun(
		{
			name: life.name,
			state: life.state as StencilState,
			printCount: life.printCount,
			ratedLifePrints: life.ratedLifePrints
		},
		overrideReason
	);
}

/** Columns of a life-log entry as the views show it. */
const eventColumns = {
	id: stencilEvents.id,
	stencilId: stencilEvents.stencilId,
	kind: stencilEvents.kind,
	at: stencilEvents.at,
	fromState: stencilEvents.fromState,
	toState: stencilEvents.toState,
	readingsNPerCm: stencilEvents.readingsNPerCm,
	detail: stencilEvents.detail,
	note: stencilEvents.note,
	by: users.name
};

/** The stencil's life log, newest first. */
export function stencilEventLog(db: Db, stencilId: number): StencilEventView[] {
	return db
		.select(eventColumns)
		.from(stencilEvents)
		.leftJoin(users, eq(users.id, stencilEvents.userId))
		.where(eq(stencilEvents.stencilId, stencilId))
		.orderBy(desc(stencilEvents.at), desc(stencilEvents.id))
		.all() as StencilEventView[];
}

/** One entry of a stencil's life log by id, or undefined. */
export function getStencilEvent(
	db: Db,
	eventId: number
): (StencilEventView & { stencilId: number }) | undefined {
	return db
		.select(eventColumns)
		.from(stencilEvents)
		.leftJoin(users, eq(users.id, stencilEvents.userId))
		.where(eq(stencilEvents.id, eventId))
		.get() as (StencilEventView & { stencilId: number }) | undefined;
}

function requireStencil(db: Db, id: number): StencilLife {
	const life = getStencilLife(db, id);
	if (!life)
		throw new PrintlogRequestError(404, [{ field: 'stencil', message: `no stencil #${id}` }]);
	return life;
}

/**
 * Move a stencil to another state, logged and audited. Releasing a quarantined stencil is an
 * engineer's decision (engineer or admin).
 * @throws PrintlogRequestError 422 when the transition is not allowed or the role may not release.
 */
export function changeStencilState(
	db: Db,
	stencilId: number,
	input: { toState: string; note?: string; at?: Date },
	actor: Actor
): StencilLife {
	return stateEntry(db, stencilId, input, actor).life;
}

function stateEntry(
	db: Db,
	stencilId: number,
	input: { toState: string; note?: string; at?: Date },
	actor: Actor
): { life: StencilLife; entryId: number } {
	return db.transaction((tx) => {
		const life = requireStencil(tx as unknown as Db, stencilId);
		const problem = stencilTransitionProblem(life.state as StencilState, input.toState);
		if (problem) throw new PrintlogRequestError(422, [{ field: 'toState', message: problem }]);
		const engineer = actor.role === 'engineer' || actor.role === 'admin';
		if (life.state === 'quarantined' && !engineer) {
			throw new PrintlogRequestError(422, [
				{ field: 'toState', message: 'only an engineer may release a quarantined stencil' }
			]);
		}
		if (input.toState === 'quarantined' && !input.note?.trim()) {
			throw new PrintlogRequestError(422, [
				{ field: 'note', message: 'say why the stencil is quarantined' }
			]);
		}
		tx.update(stencils).set({ state: input.toState }).where(eq(stencils.id, stencilId)).run();
		const entryId = insertEvent(tx as unknown as Db, stencilId, actor, {
			kind: 'state',
			at: input.at,
			fromState: life.state,
			toState: input.toState,
			note: input.note
		});
		recordAudit(tx, actor, {
			action: 'state',
			entity: 'stencil',
			entityId: stencilId,
			before: { state: life.state },
			after: { state: input.toState, note: input.note ?? '', entryId }
		});
		return { life: requireStencil(tx as unknown as Db, stencilId), entryId };
	});
}

/**
 * Record tension readings (N/cm). Implausible readings are refused; low ones are kept and
 * reported (the caller may quarantine the stencil).
 * @throws PrintlogRequestError 422 naming each implausible reading.
 */
export function recordTension(
	db: Db,
	stencilId: number,
	input: { readingsNPerCm: number[]; note?: string; at?: Date },
	actor: Actor
): TensionCheck {
	return tensionEntry(db, stencilId, input, actor).check;
}

function tensionEntry(
	db: Db,
	stencilId: number,
	input: { readingsNPerCm: number[]; note?: string; at?: Date },
	actor: Actor
): { check: TensionCheck; entryId: number } {
	const check = checkTensionReadings(input.readingsNPerCm);
	if (check.errors.length > 0) {
		throw new PrintlogRequestError(
			422,
			check.errors.map((e) => ({
				field: e.field.replace(/^readings/, 'readingsNPerCm'),
				message: e.message
			}))
		);
	}
	const entryId = db.transaction((tx) => {
		requireStencil(tx as unknown as Db, stencilId);
		const id = insertEvent(tx as unknown as Db, stencilId, actor, {
			kind: 'tension',
			at: input.at,
			readingsNPerCm: input.readingsNPerCm,
			note: input.note
		});
		recordAudit(tx, actor, {
			action: 'tension',
			entity: 'stencil',
			entityId: stencilId,
			after: {
				entryId: id,
				readingsNPerCm: input.readingsNPerCm,
				minimumNPerCm: check.minimumNPerCm,
				pass: check.pass,
				note: input.note?.trim() ?? ''
			}
		});
		return id;
	});
	return { check, entryId };
}

/** Record a cleaning or inspection entry (method or result in `detail`). */
export function recordStencilCare(
	db: Db,
	stencilId: number,
	input: { kind: 'cleaning' | 'inspection'; detail: string; note?: string; at?: Date },
	actor: Actor
): number {
	if (!input.detail.trim()) {
		const what = input.kind === 'cleaning' ? 'the cleaning method' : 'the inspection result';
		throw new PrintlogRequestError(422, [{ field: 'detail', message: `give ${what}` }]);
	}
	return db.transaction((tx) => {
		requireStencil(tx as unknown as Db, stencilId);
		const id = insertEvent(tx as unknown as Db, stencilId, actor, input);
		recordAudit(tx, actor, {
			action: input.kind,
			entity: 'stencil',
			entityId: stencilId,
			after: { entryId: id, detail: input.detail.trim(), note: input.note?.trim() ?? '' }
		});
		return id;
	});
}

/** A life-log entry as the API takes it (`kind` picks the shape). */
export type StencilLifeEntryInput =
	| { kind: 'state'; toState: string; note?: string; at?: Date }
	| { kind: 'tension'; readingsNPerCm: number[]; note?: string; at?: Date }
	| { kind: 'cleaning' | 'inspection'; detail: string; note?: string; at?: Date };

/** A stored life-log entry with the stencil's figures after it (and the tension check). */
export type StoredStencilEntry = {
	entry: StencilEventView & { stencilId: number };
	stencil: StencilLife;
	tension: TensionCheck | null;
};

/**
 * Add one entry to a stencil's life log with the same rules and audit as the page's actions:
 * a state change (allowed transitions; a quarantine needs a note; only an engineer or admin
 * releases a quarantined stencil), tension readings in N/cm (implausible ones refused, low ones
 * kept and reported), or a cleaning or inspection entry (method or result required).
 * @throws PrintlogRequestError 404 unknown stencil; 422 a rule refused the entry.
 */
export function addStencilLifeEntry(
	db: Db,
	stencilId: number,
	input: StencilLifeEntryInput,
	actor: Actor
): StoredStencilEntry {
	// Unknown stencil first: a 404 says more than a field error about an entry it cannot take.
	requireStencil(db, stencilId);
	let entryId: number;
	let tension: TensionCheck | null = null;
	if (input.kind === 'state') entryId = stateEntry(db, stencilId, input, actor).entryId;
	else if (input.kind === 'tension') {
		const stored = tensionEntry(db, stencilId, input, actor);
		entryId = stored.entryId;
		tension = stored.check;
	} else entryId = recordStencilCare(db, stencilId, input, actor);
	return {
		entry: getStencilEvent(db, entryId)!,
		stencil: requireStencil(db, stencilId),
		tension
	};
}

function insertEvent(
	db: Db,
	stencilId: number,
	actor: Actor,
	event: {
		kind: StencilEventView['kind'];
		at?: Date;
		fromState?: string;
		toState?: string;
		readingsNPerCm?: number[];
		detail?: string;
		note?: string;
	}
): number {
	// Listeners run after the caller's synchronous transaction has committed.
	publishFloorEvent({ kind: 'stencil', stencilId });
	return db
		.insert(stencilEvents)
		.values({
			stencilId,
			kind: event.kind,
			at: event.at ?? new Date(),
			fromState: event.fromState ?? null,
			toState: event.toState ?? null,
			readingsNPerCm: event.readingsNPerCm ?? null,
			detail: event.detail?.trim() ?? '',
			note: event.note?.trim() ?? '',
			userId: actor.kind === 'user' ? actor.id : null,
			actor: actorLabel(actor)
		})
		.returning({ id: stencilEvents.id })
		.get().id;
}
