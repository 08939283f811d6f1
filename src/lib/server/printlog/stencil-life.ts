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

/** A stencil with its accumulated print count and life figures. */
export type StencilLife = StencilRef & {
	printCount: number;
	/** printCount / ratedLifePrints × 100, or null without a rated life. */
	lifeUsedPct: number | null;
	/** True from 90 % of rated life. */
	nearLife: boolean;
	lastTension: { at: Date; minimumNPerCm: number; pass: boolean } | null;
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
		.select({ stencilId: stencilEvents.stencilId, at: stencilEvents.at, readings: stencilEvents.readingsNPerCm })
		.from(stencilEvents)
		.where(eq(stencilEvents.kind, 'tension'))
		.orderBy(asc(stencilEvents.at), asc(stencilEvents.id))
		.all();
	const map = new Map<number, StencilLife['lastTension']>();
	for (const row of rows) {
		const check = checkTensionReadings(row.readings ?? []);
		if (check.minimumNPerCm === null) continue;
		map.set(row.stencilId, { at: row.at, minimumNPerCm: check.minimumNPerCm, pass: check.pass });
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
export function assessStencil(life: StencilLife, overrideReason?: string | null): StencilAssessment {
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

/** The stencil's life log, newest first. */
export function stencilEventLog(db: Db, stencilId: number): StencilEventView[] {
	return db
		.select({
			id: stencilEvents.id,
			kind: stencilEvents.kind,
			at: stencilEvents.at,
			fromState: stencilEvents.fromState,
			toState: stencilEvents.toState,
			readingsNPerCm: stencilEvents.readingsNPerCm,
			detail: stencilEvents.detail,
			note: stencilEvents.note,
			by: users.name
		})
		.from(stencilEvents)
		.leftJoin(users, eq(users.id, stencilEvents.userId))
		.where(eq(stencilEvents.stencilId, stencilId))
		.orderBy(desc(stencilEvents.at), desc(stencilEvents.id))
		.all() as StencilEventView[];
}

function requireStencil(db: Db, id: number): StencilLife {
	const life = getStencilLife(db, id);
	if (!life) throw new PrintlogRequestError(404, [{ field: 'stencil', message: `no stencil #${id}` }]);
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
		insertEvent(tx as unknown as Db, stencilId, actor, {
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
			after: { state: input.toState, note: input.note ?? '' }
		});
		return requireStencil(tx as unknown as Db, stencilId);
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
	const check = checkTensionReadings(input.readingsNPerCm);
	if (check.errors.length > 0) {
		throw new PrintlogRequestError(
			422,
			check.errors.map((e) => ({ field: e.field.replace(/^readings/, 'readingsNPerCm'), message: e.message }))
		);
	}
	db.transaction((tx) => {
		requireStencil(tx as unknown as Db, stencilId);
		insertEvent(tx as unknown as Db, stencilId, actor, {
			kind: 'tension',
			at: input.at,
			readingsNPerCm: input.readingsNPerCm,
			note: input.note
		});
	});
	return check;
}

/** Record a cleaning or inspection entry (method or result in `detail`). */
export function recordStencilCare(
	db: Db,
	stencilId: number,
	input: { kind: 'cleaning' | 'inspection'; detail: string; note?: string; at?: Date },
	actor: Actor
): void {
	if (!input.detail.trim()) {
		const what = input.kind === 'cleaning' ? 'the cleaning method' : 'the inspection result';
		throw new PrintlogRequestError(422, [{ field: 'detail', message: `give ${what}` }]);
	}
	db.transaction((tx) => {
		requireStencil(tx as unknown as Db, stencilId);
		insertEvent(tx as unknown as Db, stencilId, actor, input);
	});
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
): void {
	db.insert(stencilEvents)
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
		.run();
}
