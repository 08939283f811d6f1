import { asc, desc, eq } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import {
	assessLotForRun,
	checkNextPasteEvent,
	isLeadBearing,
	lotDateWarnings,
	replayPasteEvents,
	resolvePasteHandling,
	type LotAssessment,
	type PasteEvent,
	type PasteHandlingSettings,
	type PasteState
} from '$lib/printlog';
import type { PasteEventPayload, PasteLotPayload } from '$lib/schemas/printlog';
import { actorLabel, recordAudit } from '../audit';
import type { Db } from '../db';
import { pasteEvents, pasteLots, users } from '../db/schema';
import { pasteLotIdByNumber } from './lookups';
import { PrintlogRequestError } from './request-error';
import { publishFloorEvent } from '../floor/events';

/** A paste lot with its handling settings, current state and flags for the pages and the API. */
export type PasteLotView = {
	id: number;
	lotNumber: string;
	alloy: string;
	powderType: number;
	fluxClass: string | null;
	containerGrams: number | null;
	receivedOn: string | null;
	expiresOn: string;
	handling: PasteHandlingSettings;
	leadBearing: boolean;
	state: PasteState | 'inconsistent';
	createdAt: Date;
	events: PasteEventView[];
	/** What a run started now would be told about this lot. */
	assessment: LotAssessment;
};

/** One logged handling event. */
export type PasteEventView = {
	id: number;
	event: string;
	at: Date;
	note: string;
	by: string | null;
};

type LotRow = typeof pasteLots.$inferSelect;

function eventsOf(db: Db, lotId: number): PasteEventView[] {
	return db
		.select({
			id: pasteEvents.id,
			event: pasteEvents.event,
			at: pasteEvents.at,
			note: pasteEvents.note,
			by: users.name
		})
		.from(pasteEvents)
		.leftJoin(users, eq(users.id, pasteEvents.userId))
		.where(eq(pasteEvents.lotId, lotId))
		.orderBy(asc(pasteEvents.at), asc(pasteEvents.id))
		.all();
}

const handlingOf = (row: LotRow): PasteHandlingSettings => ({
	warmUpMinutes: row.warmUpMinutes,
	maxOnStencilMinutes: row.maxOnStencilMinutes,
	maxOutOfColdMinutes: row.maxOutOfColdMinutes
});

/** Events as the pure rules take them. */
export const asPasteEvents = (events: readonly PasteEventView[]): PasteEvent[] =>
	events.map((e) => ({ event: e.event, at: e.at.getTime(), note: e.note }));

function toView(db: Db, row: LotRow, nowMs: number): PasteLotView {
	const events = eventsOf(db, row.id);
	const replay = replayPasteEvents(asPasteEvents(events), nowMs);
	return {
		id: row.id,
		lotNumber: row.lotNumber,
		alloy: row.alloy,
		powderType: row.powderType,
		fluxClass: row.fluxClass,
		containerGrams: row.containerGrams,
		receivedOn: row.receivedOn,
		expiresOn: row.expiresOn,
		handling: handlingOf(row),
		leadBearing: isLeadBearing(row.alloy),
		state: replay.ok ? replay.timeline.state : 'inconsistent',
		createdAt: row.createdAt,
		events,
		assessment: assessLotForRun(row, asPasteEvents(events), handlingOf(row), nowMs)
	};
}

/** Every paste lot, newest first, with state and assessment at `nowMs`. */
export function listPasteLots(db: Db, nowMs = Date.now()): PasteLotView[] {
	return db
		.select()
		.from(pasteLots)
		.orderBy(desc(pasteLots.id))
		.all()
		.map((row) => toView(db, row, nowMs));
}

/** One lot by id, or by lot number when `ref` is not an id of a lot. */
export function getPasteLot(
	db: Db,
	ref: number | string,
	nowMs = Date.now()
): PasteLotView | undefined {
	const byNumber = typeof ref === 'string' ? pasteLotIdByNumber(db, ref) : undefined;
	const id = byNumber ?? (/^\d+$/.test(String(ref)) ? Number(ref) : undefined);
	if (id === undefined) return undefined;
	const row = db.select().from(pasteLots).where(eq(pasteLots.id, id)).get();
	return row && toView(db, row, nowMs);
}

/**
 * Register a paste lot with its handling settings (defaults where not given, common practice).
 * @throws PrintlogRequestError 409 when the lot number exists.
 */
export function createPasteLot(
	db: Db,
	input: PasteLotPayload,
	actor: Actor | null,
	nowMs = Date.now()
): PasteLotView {
	const { settings } = resolvePasteHandling(input);
	// Valid but implausible dates (already expired, years ahead) are registered only when confirmed.
	const dateWarnings = lotDateWarnings(input, nowMs);
	if (dateWarnings.length && !input.confirmDates) {
		throw new PrintlogRequestError(
			422,
			dateWarnings,
			`Check the dates: ${dateWarnings.map((w) => w.message).join('; ')}. Send "confirmDates": true to register the lot anyway.`,
			{ needsConfirmation: true }
		);
	}
	return db.transaction((tx) => {
		if (pasteLotIdByNumber(tx as unknown as Db, input.lotNumber) !== undefined) {
			throw new PrintlogRequestError(409, [
				{ field: 'lotNumber', message: `a paste lot "${input.lotNumber}" already exists` }
			]);
		}
		const row = tx
			.insert(pasteLots)
			.values({
				lotNumber: input.lotNumber.trim(),
				alloy: input.alloy.trim(),
				powderType: input.powderType,
				fluxClass: input.fluxClass || null,
				containerGrams: input.containerGrams ?? null,
				receivedOn: input.receivedOn || null,
				expiresOn: input.expiresOn,
				...settings,
				createdByUserId: actor?.kind === 'user' ? actor.id : null
			})
			.returning()
			.get();
		recordAudit(tx, actor, {
			action: 'create',
			entity: 'paste_lot',
			entityId: row.id,
			after: {
				...row,
				createdAt: row.createdAt.toISOString(),
				...(dateWarnings.length && { datesConfirmed: dateWarnings.map((w) => w.message) })
			}
		});
		return toView(tx as unknown as Db, row, nowMs);
	});
}

/**
 * Log a handling event on a lot after the state machine accepts it; returns the lot and any
 * warnings (e.g. opened before the warm-up time).
 * @throws PrintlogRequestError 404 unknown lot; 422 when the event may not follow.
 */
export function addPasteEvent(
	db: Db,
	ref: number | string,
	input: PasteEventPayload,
	actor: Actor | null,
	nowMs = Date.now()
): { lot: PasteLotView; warnings: string[] } {
	return db.transaction((tx) => {
		const lot = getPasteLot(tx as unknown as Db, ref, nowMs);
		if (!lot)
			throw new PrintlogRequestError(404, [{ field: 'id', message: `no paste lot "${ref}"` }]);
		const atMs = input.at ? Date.parse(input.at) : nowMs;
		const check = checkNextPasteEvent(
			asPasteEvents(lot.events),
			{ event: input.event, at: atMs },
			lot.handling
		);
		if (check.error) {
			const field = check.error.field === 'events' ? 'event' : check.error.field;
			throw new PrintlogRequestError(422, [{ field, message: check.error.message }]);
		}
		const row = tx
			.insert(pasteEvents)
			.values({
				lotId: lot.id,
				event: input.event,
				at: new Date(atMs),
				note: input.note ?? '',
				userId: actor?.kind === 'user' ? actor.id : null,
				actor: actorLabel(actor)
			})
			.returning({ id: pasteEvents.id })
			.get();
		recordAudit(tx, actor, {
			action: 'paste-event',
			entity: 'paste_lot',
			entityId: lot.id,
			after: {
				eventId: row.id,
				event: input.event,
				at: new Date(atMs).toISOString(),
				note: input.note ?? ''
			}
		});
		// Listeners run after this synchronous transaction has committed.
		publishFloorEvent({ kind: 'paste-lot', lotId: lot.id });
		return { lot: getPasteLot(tx as unknown as Db, lot.id, nowMs)!, warnings: check.warn };
	});
}

/**
 * Change a lot's handling limits (minutes) to the paste data sheet's figures; audited with the
 * old and new values. Blank (undefined) keeps a value.
 * @throws PrintlogRequestError 404 unknown lot; 422 naming each implausible limit.
 */
export function updatePasteHandling(
	db: Db,
	ref: number | string,
	overrides: Partial<Record<keyof PasteHandlingSettings, unknown>>,
	actor: Actor | null,
	nowMs = Date.now()
): PasteLotView {
	return db.transaction((tx) => {
		const lot = getPasteLot(tx as unknown as Db, ref, nowMs);
		if (!lot)
			throw new PrintlogRequestError(404, [{ field: 'id', message: `no paste lot "${ref}"` }]);
		const merged = {
			...lot.handling,
			...Object.fromEntries(Object.entries(overrides).filter(([, v]) => v !== undefined))
		};
		const { settings, errors } = resolvePasteHandling(merged);
		if (errors.length) throw new PrintlogRequestError(422, errors);
		tx.update(pasteLots).set(settings).where(eq(pasteLots.id, lot.id)).run();
		recordAudit(tx, actor, {
			action: 'handling',
			entity: 'paste_lot',
			entityId: lot.id,
			before: { ...lot.handling },
			after: { ...settings }
		});
		publishFloorEvent({ kind: 'paste-lot', lotId: lot.id });
		return getPasteLot(tx as unknown as Db, lot.id, nowMs)!;
	});
}
