import { and, eq, inArray, isNull, lte } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import { Refusal, type FieldProblem } from '$lib/errors';
import { recordAudit } from '../audit';
import type { Db } from '../db';
import { spcCharacteristics, spcFollowers, spcSignals, users } from '../db/schema';
import { sendMail } from '../mail';
import { publishFloorEvent } from './events';

/**
 * A refused assignment: unknown signal 404, acknowledged 409, unknown or inactive person 422. The
 * API's 422 answer is `{ errors: [{ field, message }] }` (its documented contract), others `{ error }`.
 */
export class AssignError extends Refusal {
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
		return { errors: [{ field: this.field ?? 'userId', message: this.message }] };
	}
}

export interface SignalOwner {
	id: number;
	assignee: { id: number; name: string; email: string } | null;
	assignedAt: Date | null;
}

/** The owner of a signal, or undefined for an unknown signal. */
export function signalOwner(db: Db, id: number): SignalOwner | undefined {
	const row = db
		.select({
			id: spcSignals.id,
			assignedAt: spcSignals.assignedAt,
			userId: users.id,
			name: users.name,
			email: users.email
		})
		.from(spcSignals)
		.leftJoin(users, eq(users.id, spcSignals.assigneeUserId))
		.where(eq(spcSignals.id, id))
		.get();
	if (!row) return undefined;
	return {
		id: row.id,
		assignee: row.userId ? { id: row.userId, name: row.name!, email: row.email! } : null,
		assignedAt: row.assignedAt
	};
}

/**
 * Give an open signal an owner (a user id) or take it away (null); audited with the previous
 * owner. Assigning the owner it already has changes nothing and is not audited again.
 * @throws AssignError 404 unknown signal, 409 acknowledged, 422 unknown or inactive person.
 */
export function assignSignal(db: Db, id: number, userId: number | null, actor: Actor): SignalOwner {
	const signal = db
		.select({ id: spcSignals.id, ackAt: spcSignals.ackAt, assignee: spcSignals.assigneeUserId })
		.from(spcSignals)
		.where(eq(spcSignals.id, id))
		.get();
	if (!signal) throw new AssignError(404, `No signal with id ${id}.`);
	if (signal.ackAt) {
		throw new AssignError(
			409,
			`Signal ${id} was acknowledged at ${signal.ackAt.toISOString()}; it needs no owner.`
		);
	}
	if (userId !== null) {
		const user = db
			.select({ id: users.id, active: users.active })
			.from(users)
			.where(eq(users.id, userId))
			.get();
		if (!user) throw new AssignError(422, `No person with id ${userId}.`, 'userId');
		if (!user.active) throw new AssignError(422, `Person ${userId} is deactivated.`, 'userId');
	}
	if (signal.assignee === userId) return signalOwner(db, id)!;
	db.transaction((tx) => {
		tx.update(spcSignals)
			.set({ assigneeUserId: userId, assignedAt: userId === null ? null : new Date() })
			.where(eq(spcSignals.id, id))
			.run();
		recordAudit(tx, actor, {
			action: 'assign-signal',
			entity: 'spc-signal',
			entityId: id,
			before: { assigneeUserId: signal.assignee },
			after: { assigneeUserId: userId }
		});
	});
	publishFloorEvent({ kind: 'signal', what: 'assigned', signalIds: [id] });
	return signalOwner(db, id)!;
}

/** People a signal can be given to: active users who work on the floor, by name. */
export function assignableUsers(db: Db): { id: number; name: string; role: string }[] {
	return db
		.select({ id: users.id, name: users.name, role: users.role })
		.from(users)
		.where(
			and(
				eq(users.active, true),
				inArray(users.role, ['technician', 'quality', 'engineer', 'admin'])
			)
		)
		.orderBy(users.name)
		.all();
}

/** Escalation delay from SIGNAL_ESCALATE_MINUTES (default 60; 0 turns escalation off). */
export function escalateAfterMinutes(env: NodeJS.ProcessEnv = process.env): number {
	const raw = env.SIGNAL_ESCALATE_MINUTES?.trim();
	if (raw === undefined || raw === '') return 60;
	const n = Number(raw);
	// A typo must not silence escalation: only a clear 0 turns it off.
	return Number.isFinite(n) && n >= 0 ? n : 60;
}

/** Signals escalated per pass at most (the rest wait for the next pass). */
const ESCALATE_BATCH = 200;

/**
 * Mail every unacknowledged signal older than `afterMinutes` once: to its owner, else to the
 * chart's followers, else to every active quality and process engineer. One mail per person per
 * pass lists their signals; each signal is marked escalated (and audited) in the same
 * transaction as the outbox rows are written, so a signal is never escalated twice.
 * @returns the ids escalated.
 */
export async function escalateOverdueSignals(
	db: Db,
	afterMinutes: number,
	nowMs = Date.now()
): Promise<number[]> {
	if (!(afterMinutes > 0)) return [];
	const cutoff = new Date(nowMs - afterMinutes * 60_000);
	const due = db
		.select({
			id: spcSignals.id,
			rule: spcSignals.rule,
			createdAt: spcSignals.createdAt,
			pointKey: spcSignals.pointKey,
			characteristicId: spcSignals.characteristicId,
			chart: spcCharacteristics.name,
			ownerEmail: users.email
		})
		.from(spcSignals)
		.innerJoin(spcCharacteristics, eq(spcCharacteristics.id, spcSignals.characteristicId))
		.leftJoin(users, and(eq(users.id, spcSignals.assigneeUserId), eq(users.active, true)))
		.where(
			and(
				isNull(spcSignals.ackAt),
				isNull(spcSignals.escalatedAt),
				lte(spcSignals.createdAt, cutoff)
			)
		)
		.orderBy(spcSignals.id)
		.limit(ESCALATE_BATCH)
		.all();
	if (due.length === 0) return [];
	const followers = new Map<number, string[]>();
	for (const row of db
		.select({ chart: spcFollowers.characteristicId, email: users.email })
		.from(spcFollowers)
		.innerJoin(users, and(eq(users.id, spcFollowers.userId), eq(users.active, true)))
		.where(inArray(spcFollowers.characteristicId, [...new Set(due.map((d) => d.characteristicId))]))
		.all()) {
		followers.set(row.chart, [...(followers.get(row.chart) ?? []), row.email]);
	}
	const fallback = db
		.select({ email: users.email })
		.from(users)
		.where(and(eq(users.active, true), inArray(users.role, ['quality', 'engineer'])))
		.all()
		.map((u) => u.email);
	const byPerson = new Map<string, typeof due>();
	for (const s of due) {
		const to = s.ownerEmail ? [s.ownerEmail] : (followers.get(s.characteristicId) ?? fallback);
		for (const email of to) byPerson.set(email, [...(byPerson.get(email) ?? []), s]);
	}
	const ids = due.map((d) => d.id);
	db.transaction((tx) => {
		tx.update(spcSignals)
			.set({ escalatedAt: new Date(nowMs) })
			.where(inArray(spcSignals.id, ids))
			.run();
		recordAudit(tx, null, {
			action: 'escalate-signal',
			entity: 'spc-signal',
			entityId: ids.length === 1 ? ids[0] : null,
			after: { ids, afterMinutes, recipients: [...byPerson.keys()] }
		});
	});
	const origin = (process.env.ORIGIN ?? '').replace(/\/$/, '');
	for (const [email, signals] of byPerson) {
		const lines = signals.map((s) => {
			const age = Math.floor((nowMs - s.createdAt.getTime()) / 60_000);
			return `- ${s.chart}: rule ${s.rule} at ${s.pointKey}, open ${age} min — ${origin}/signals?status=open`;
		});
		await sendMail(db, {
			to: [email],
			kind: 'signal-escalation',
			subject: `Rollbead: ${signals.length} signal${signals.length === 1 ? '' : 's'} open for more than ${afterMinutes} min`,
			text:
				`These control chart signals have not been acknowledged within ${afterMinutes} minutes:\n\n` +
				lines.join('\n') +
				'\n\nAcknowledge each with its cause and action, or give it an owner, on the line view or the signals page.\n'
		});
	}
	publishFloorEvent({ kind: 'signal', what: 'escalated', signalIds: ids });
	return ids;
}

let escalationTimer: ReturnType<typeof setInterval> | null = null;

/** Check for overdue signals every minute (started from startup; a no-op when turned off). */
export function startSignalEscalation(db: Db, env: NodeJS.ProcessEnv = process.env): void {
	const minutes = escalateAfterMinutes(env);
	if (escalationTimer || minutes === 0) return;
	const check = () =>
		void escalateOverdueSignals(db, minutes).catch((err) =>
			console.error('[floor] signal escalation failed', err)
		);
	escalationTimer = setInterval(check, 60_000);
	escalationTimer.unref?.();
	check();
}
