import { and, desc, eq, gte, inArray, isNotNull, isNull, lte, sql, type SQL } from 'drizzle-orm';
import {
	causeChoiceError,
	runIdFor,
	signalCandidates,
	type ChartLimits,
	type RunMember
} from '$lib/spc';
import type { Actor } from '$lib/access';
import { Refusal, type FieldProblem } from '$lib/errors';
import type { Db } from '../db';
import { spcSignals } from '../db/schema';
import { recordAudit } from '../audit';
import { characteristicsFor, loadSubgroups, type CharacteristicRow } from './chart-source';
import { characteristicsByIds, latestLimitVersion } from './chart-service';
import { getCauseLists } from './cause-lists';
import { patternTargets } from './ack-scope';
import { flushDigests, notifyFollowers } from './signal-mail';
import { boardScopes } from './spi-source';
import { publishFloorEvent } from '../floor/events';

export type SignalRow = typeof spcSignals.$inferSelect;

/** Subgroups re-read per evaluation: rules look back at most 15 points, so this is exact. */
export const EVALUATION_TAIL = 40;

/**
 * Judge a characteristic's newest points against its newest frozen limits and store each new
 * violation (idempotent: a violation already stored is not stored again). Points inside the
 * baseline are not judged. Signals that continue an earlier pattern of the same rule join its
 * run (`runId`); the others start a run.
 * @returns the newly stored signals, oldest first.
 */
export function evaluateCharacteristic(
	db: Db,
	c: CharacteristicRow,
	tail = EVALUATION_TAIL
): SignalRow[] {
	const version = latestLimitVersion(db, c.id);
	if (!version) return [];
	const limits = version.limits as unknown as ChartLimits;
	if (limits.kind !== c.chartKind) return [];
	const candidates = signalCandidates(
		c,
		loadSubgroups(db, c, tail),
		limits,
		version.baselineTo ?? null
	);
	if (candidates.length === 0) return [];
	// Most violations in the tail are stored already: find those first with one indexed query,
	// so an import only writes what is new.
	const tailKeys = [...new Set(candidates.map((v) => v.pointKey))];
	const stored = db
		.select({ rule: spcSignals.rule, part: spcSignals.chartPart, key: spcSignals.pointKey })
		.from(spcSignals)
		.where(
			and(
				eq(spcSignals.characteristicId, c.id),
				eq(spcSignals.limitVersionId, version.id),
				inArray(spcSignals.pointKey, tailKeys)
			)
		)
		.all();
	const seen = new Set(stored.map((r) => `${r.rule}|${r.part}|${r.key}`));
	const fresh = candidates.filter((v) => !seen.has(`${v.rule}|${v.chartPart}|${v.pointKey}`));
	if (fresh.length === 0) return [];
	return db.transaction((tx) => {
		// Runs continue only from the latest signals (patterns span at most 15 points).
		const recent: RunMember[] = tx
			.select({
				id: spcSignals.id,
				rule: spcSignals.rule,
				chartPart: spcSignals.chartPart,
				pointKey: spcSignals.pointKey,
				pointKeys: spcSignals.pointKeys,
				runId: spcSignals.runId
			})
			.from(spcSignals)
			.where(and(eq(spcSignals.characteristicId, c.id), eq(spcSignals.limitVersionId, version.id)))
			.orderBy(desc(spcSignals.id))
			.limit(200)
			.all();
		const created: SignalRow[] = [];
		for (const v of fresh) {
			const row = tx
				.insert(spcSignals)
				.values({
					characteristicId: c.id,
					limitVersionId: version.id,
					rule: v.rule,
					chartPart: v.chartPart,
					pointKey: v.pointKey,
					pointKeys: v.pointKeys,
					boardIds: v.boardIds,
					pointAt: v.pointAt,
					value: v.value
				})
				.onConflictDoNothing()
				.returning()
				.get();
			if (!row) continue;
			const runId = runIdFor(recent, row, v);
			tx.update(spcSignals).set({ runId }).where(eq(spcSignals.id, row.id)).run();
			const stored = { ...row, runId };
			recent.unshift(stored);
			created.push(stored);
		}
		return created;
	});
}

/** New signals that start a run: the ones a mail is about. */
export const startsRun = (s: SignalRow) => s.runId === s.id;

/**
 * Evaluate every active characteristic fed by data of this product (and line), store new
 * signals and mail the followers (one mail per chart per new run set; digests when busy).
 * Call after each committed print run or SPI import.
 */
export async function evaluateSignalsFor(
	db: Db,
	scopes: { productId: number; lineId: number | null }[]
): Promise<SignalRow[]> {
	const seen = new Set<number>();
	const created: SignalRow[] = [];
	for (const scope of scopes) {
		for (const c of characteristicsFor(db, scope.productId, scope.lineId)) {
			if (seen.has(c.id)) continue;
			seen.add(c.id);
			created.push(...evaluateCharacteristic(db, c));
		}
	}
	if (created.length)
		publishFloorEvent({ kind: 'signal', what: 'raised', signalIds: created.map((s) => s.id) });
	const runs = created.filter(startsRun);
	if (runs.length) {
		await notifyFollowers(db, runs);
	}
	return created;
}

/** Filters of `listSignals`. */
export interface SignalFilters {
	status?: 'open' | 'acknowledged' | 'all';
	characteristicId?: number;
	rule?: string;
	from?: Date | null;
	to?: Date | null;
	limit?: number;
	ids?: number[];
}

/** A signal with its chart's names, for lists and the API. */
export interface SignalSummary extends SignalRow {
	characteristicName: string;
	productCode: string;
	lineCodes: string[];
	unit: string;
	status: 'open' | 'acknowledged';
}

/** Stored signals, newest first, filtered. */
export function listSignals(db: Db, filters: SignalFilters = {}): SignalSummary[] {
	const where: (SQL | undefined)[] = [
		filters.status === 'open' ? isNull(spcSignals.ackAt) : undefined,
		filters.status === 'acknowledged' ? isNotNull(spcSignals.ackAt) : undefined,
		filters.characteristicId
			? eq(spcSignals.characteristicId, filters.characteristicId)
			: undefined,
		filters.rule ? eq(spcSignals.rule, filters.rule) : undefined,
		filters.from ? gte(spcSignals.createdAt, filters.from) : undefined,
		filters.to ? lte(spcSignals.createdAt, filters.to) : undefined,
		filters.ids ? inArray(spcSignals.id, filters.ids) : undefined
	];
	const rows = db
		.select()
		.from(spcSignals)
		.where(and(...where))
		.orderBy(desc(spcSignals.id))
		.limit(Math.max(1, Math.min(1000, filters.limit ?? 200)))
		.all();
	const chars = new Map(
		characteristicsByIds(db, [...new Set(rows.map((r) => r.characteristicId))]).map((c) => [
			c.id,
			c
		])
	);
	return rows.map((r) => {
		const c = chars.get(r.characteristicId);
		return {
			...r,
			characteristicName: c?.name ?? `#${r.characteristicId}`,
			productCode: c?.productCode ?? '',
			lineCodes: c?.lineCodes ?? [],
			unit: c?.unit ?? '',
			status: r.ackAt ? 'acknowledged' : 'open'
		};
	});
}

/** Open signal counts per characteristic. */
export function openSignalCounts(db: Db): Map<number, number> {
	return new Map(
		db
			.select({ id: spcSignals.characteristicId, n: sql<number>`count(*)` })
			.from(spcSignals)
			.where(isNull(spcSignals.ackAt))
			.groupBy(spcSignals.characteristicId)
			.all()
			.map((r) => [r.id, r.n])
	);
}

/**
 * A refused acknowledgement (unknown signal 404, already done 409, bad field 422). The API's 422
 * answer is `{ errors: [{ field, message }] }` (its documented contract), the others `{ error }`.
 */
export class AcknowledgeError extends Refusal {
	constructor(
		readonly status: 404 | 409 | 422,
		message: string,
		readonly field?: string
	) {
		super(message);
	}

	override get fieldProblems(): FieldProblem[] {
		return this.field ? [{ field: this.field, message: this.message }] : [];
	}

	override body(): Record<string, unknown> {
		if (this.status !== 422) return { error: this.message };
		return { errors: [{ field: this.field ?? 'body', message: this.message }] };
	}
}

/** Body of an acknowledgement. */
export interface AcknowledgeInput {
	cause: string;
	action: string;
	note?: string;
	/** Also acknowledge the other open signals of the same run on the same chart. */
	wholeRun?: boolean;
	/** How many signals the person saw it would close; a different number is refused (409). */
	expectedCount?: number;
}

/**
 * Acknowledge a signal with an assignable cause and a corrective action from the site lists,
 * plus a note; records who and when (audited).
 * @throws AcknowledgeError (404 unknown, 409 already acknowledged, 422 cause/action not listed).
 */
export function acknowledgeSignal(
	db: Db,
	id: number,
	input: AcknowledgeInput,
	actor: Actor
): SignalSummary[] {
	const row = db.select().from(spcSignals).where(eq(spcSignals.id, id)).get();
	if (!row) throw new AcknowledgeError(404, `No signal with id ${id}.`);
	if (row.ackAt)
		throw new AcknowledgeError(
			409,
			`Signal ${id} was already acknowledged by ${row.ackBy} at ${row.ackAt.toISOString()}.`
		);
	const refused = causeChoiceError(getCauseLists(db), input.cause, input.action);
	if (refused) throw new AcknowledgeError(422, refused.message, refused.field);
	const now = new Date();
	const ids = db.transaction((tx) => {
		// The wider scope stays on this chart: the open signals of the same run of the same rule.
		const targets = input.wholeRun ? patternTargets(tx, row) : [id];
		if (input.expectedCount !== undefined && targets.length !== input.expectedCount) {
			throw new AcknowledgeError(
				409,
				`This would now close ${targets.length} signals, not ${input.expectedCount}: the list changed; look again and confirm.`
			);
		}
		tx.update(spcSignals)
			.set({
				ackCause: input.cause,
				ackAction: input.action,
				ackNote: (input.note ?? '').slice(0, 2000),
				ackByUserId: actor.kind === 'user' ? actor.id : null,
				ackBy: actor.name,
				ackAt: now
			})
			.where(inArray(spcSignals.id, targets))
			.run();
		recordAudit(tx, actor, {
			action: 'acknowledge-signal',
			entity: 'spc-signal',
			entityId: id,
			before: { status: 'open' },
			after: { ids: targets, cause: input.cause, action: input.action, note: input.note ?? '' }
		});
		return targets;
	});
	publishFloorEvent({ kind: 'signal', what: 'acknowledged', signalIds: ids });
	return listSignals(db, { ids, limit: 1000 });
}

/** One signal by id, with names. */
export function getSignal(db: Db, id: number): SignalSummary | undefined {
	return listSignals(db, { ids: [id] })[0];
}

/**
 * Call after each committed SPI import with the ids of the boards it stored: evaluates the
 * charts those boards feed (their product and line), stores new signals and mails followers.
 * Never throws for evaluation problems of one chart (logged), so an import is never undone by
 * charting. Also flushes digests that are due.
 * @example await evaluateSignalsAfterIngest(db, [101, 102])
 */
export async function evaluateSignalsAfterIngest(db: Db, boardIds: number[]): Promise<SignalRow[]> {
	try {
		await flushDigests(db);
		return await evaluateSignalsFor(db, boardScopes(db, boardIds));
	} catch (err) {
		console.error('[spc] signal evaluation after ingest failed', err);
		return [];
	}
}

/**
 * Call after a print run is logged or corrected: evaluates the print-parameter charts of its
 * product and line. Like `evaluateSignalsAfterIngest`, it logs instead of throwing.
 */
export async function evaluateSignalsAfterPrintRun(
	db: Db,
	run: { productId: number; lineId: number }
): Promise<SignalRow[]> {
	try {
		return await evaluateSignalsFor(db, [run]);
	} catch (err) {
		console.error('[spc] signal evaluation after a print run failed', err);
		return [];
	}
}
