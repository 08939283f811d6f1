import { createHash, randomBytes } from 'node:crypto';
import { eq, lt, or, sql } from 'drizzle-orm';
import type { Db } from './db';
import { sessions } from './db/schema';

/** Positive number from the environment, else the default (a typo never removes a timeout). */
function positiveSetting(value: string | undefined, fallback: number): number {
	const n = Number(value);
	return value !== undefined && value.trim() !== '' && Number.isFinite(n) && n > 0 ? n : fallback;
}

export type SessionTimeouts = { idleMs: number; absoluteMs: number };

/**
 * SESSION_IDLE_MINUTES (default 120): signed out after this long without a request.
 * SESSION_MAX_HOURS (default 12, about a shift): signed out this long after signing in, whatever.
 */
export function sessionTimeouts(env: NodeJS.ProcessEnv = process.env): SessionTimeouts {
	return {
		idleMs: positiveSetting(env.SESSION_IDLE_MINUTES, 120) * 60_000,
		absoluteMs: positiveSetting(env.SESSION_MAX_HOURS, 12) * 3_600_000
	};
}

/** lastSeenAt is written at most this often per session (not on every request). */
const TOUCH_EVERY_MS = 60_000;

const hashId = (id: string) => createHash('sha256').update(id).digest('hex');

/** Start a session for a user who has just signed in; returns the id the cookie carries. */
export function createSession(db: Db, userId: number, now = Date.now()): string {
	const id = randomBytes(32).toString('base64url');
	pruneSessions(db, now);
	db.insert(sessions)
		.values({ idHash: hashId(id), userId, createdAt: new Date(now), lastSeenAt: new Date(now) })
		.run();
	return id;
}

/**
 * The user id a live session belongs to, or undefined when the session was ended or timed out
 * (a timed-out row is removed). Touches lastSeenAt (at most once a minute). Whether that user may
 * still sign in is users.ts's question (`userForSession`), so this module needs nothing of it.
 */
export function sessionUserId(
	db: Db,
	sessionId: unknown,
	now = Date.now(),
	timeouts = sessionTimeouts()
): number | undefined {
	if (typeof sessionId !== 'string' || sessionId.length === 0 || sessionId.length > 100)
		return undefined;
	const row = db
		.select()
		.from(sessions)
		.where(eq(sessions.idHash, hashId(sessionId)))
		.get();
	if (!row) return undefined;
	const idle = now - row.lastSeenAt.getTime() > timeouts.idleMs;
	const tooOld = now - row.createdAt.getTime() > timeouts.absoluteMs;
	if (idle || tooOld) {
		db.delete(sessions).where(eq(sessions.id, row.id)).run();
		return undefined;
	}
	if (now - row.lastSeenAt.getTime() > TOUCH_EVERY_MS) {
		db.update(sessions)
			.set({ lastSeenAt: new Date(now) })
			.where(eq(sessions.id, row.id))
			.run();
	}
	return row.userId;
}

/** End one session (sign-out). */
export function endSession(db: Pick<Db, 'delete'>, sessionId: unknown): void {
	if (typeof sessionId !== 'string' || !sessionId) return;
	db.delete(sessions)
		.where(eq(sessions.idHash, hashId(sessionId)))
		.run();
}

/** End every session of a user ("sign out everywhere", password change, role change, deactivation). */
export function endUserSessions(db: Pick<Db, 'delete'>, userId: number): number {
	return db.delete(sessions).where(eq(sessions.userId, userId)).run().changes;
}

/** Live sessions per user id, for the people page. */
export function sessionCounts(db: Db, now = Date.now()): Map<number, number> {
	pruneSessions(db, now);
	const rows = db
		.select({ userId: sessions.userId, n: sql<number>`count(*)` })
		.from(sessions)
		.groupBy(sessions.userId)
		.all();
	return new Map(rows.map((r) => [r.userId, r.n]));
}

export function countUserSessions(db: Db, userId: number): number {
	return db.select({ id: sessions.id }).from(sessions).where(eq(sessions.userId, userId)).all()
		.length;
}

/** Drop sessions past either timeout, so the table holds only live ones. */
export function pruneSessions(
	db: Pick<Db, 'delete'>,
	now = Date.now(),
	timeouts = sessionTimeouts()
): void {
	db.delete(sessions)
		.where(
			or(
				lt(sessions.lastSeenAt, new Date(now - timeouts.idleMs)),
				lt(sessions.createdAt, new Date(now - timeouts.absoluteMs))
			)
		)
		.run();
}
