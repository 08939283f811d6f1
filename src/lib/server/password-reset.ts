import { createHash, randomBytes } from 'node:crypto';
import { and, eq, gt, isNull, sql } from 'drizzle-orm';
import type { Db } from './db';
import { passwordResets, users } from './db/schema';
import { sendMail } from './mail';
import { changePassword } from './users';
import { Refusal } from '$lib/errors';

/** A reset link works once, for this long. */
export const RESET_LINK_TTL_MS = 30 * 60_000;
/** At most this many links per address, and this many requests per client address, per window. */
export const RESET_MAX_PER_ACCOUNT = 3;
export const RESET_MAX_PER_IP = 10;
export const RESET_WINDOW_MS = 60 * 60_000;

const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');

/** Requests per client address (in memory: a restart forgives, which is fine for a throttle). */
const requestsByIp = new Map<string, number[]>();

function ipAllowed(ip: string, now: number): boolean {
	const recent = (requestsByIp.get(ip) ?? []).filter((t) => t > now - RESET_WINDOW_MS);
	recent.push(now);
	requestsByIp.set(ip, recent);
	if (requestsByIp.size > 10_000) {
		for (const [key, times] of requestsByIp) {
			if (times.every((t) => t <= now - RESET_WINDOW_MS)) requestsByIp.delete(key);
		}
	}
	return recent.length <= RESET_MAX_PER_IP;
}

export function forgetResetThrottle(): void {
	requestsByIp.clear();
}

export type ResetRequestOutcome = 'sent' | 'unknown' | 'throttled';

/**
 * Someone asks for a reset link. The page answers the same whatever happens here; the outcome is
 * for tests and logs only. The link is built from `origin` (ORIGIN), never from request headers.
 */
export async function requestPasswordReset(
	db: Db,
	emailInput: string,
	ip: string,
	origin: string,
	now = Date.now()
): Promise<ResetRequestOutcome> {
	if (!ipAllowed(ip, now)) return 'throttled';
	const email = emailInput.trim().toLowerCase();
	const user = db
		.select({ id: users.id, name: users.name, email: users.email })
		.from(users)
		.where(and(eq(users.email, email), eq(users.active, true)))
		.get();
	if (!user) return 'unknown';
	const recent =
		db
			.select({ n: sql<number>`count(*)` })
			.from(passwordResets)
			.where(
				and(
					eq(passwordResets.userId, user.id),
					gt(passwordResets.createdAt, new Date(now - RESET_WINDOW_MS))
				)
			)
			.get()?.n ?? 0;
	if (recent >= RESET_MAX_PER_ACCOUNT) return 'throttled';
	const token = randomBytes(32).toString('base64url');
	db.insert(passwordResets)
		.values({
			tokenHash: hashToken(token),
			userId: user.id,
			createdAt: new Date(now),
			expiresAt: new Date(now + RESET_LINK_TTL_MS)
		})
		.run();
	const link = `${new URL(origin).origin}/signin/reset?token=${token}`;
	await sendMail(db, {
		to: [user.email],
		subject: 'Rollbead: set a new password',
		kind: 'password-reset',
		text:
			`Hello ${user.name},\n\nSomeone (probably you) asked to set a new Rollbead password for ${user.email}.\n` +
			`Open this link within 30 minutes to choose one; it works once:\n\n${link}\n\n` +
			`If you did not ask, ignore this mail: your password stays as it is.\n`
	});
	return 'sent';
}

export class ResetLinkError extends Refusal {
	readonly status = 410;
	constructor() {
		super(
			'This link is not valid any more: it was used, it expired (30 minutes) or it was never sent. Ask for a new one.'
		);
	}
}

/** Is this link still usable? (for the page, before the person types a password) */
export function resetLinkUsable(db: Db, token: string, now = Date.now()): boolean {
	return !!liveReset(db, token, now);
}

function liveReset(db: Pick<Db, 'select'>, token: string, now: number) {
	return db
		.select()
		.from(passwordResets)
		.where(
			and(
				eq(passwordResets.tokenHash, hashToken(token)),
				isNull(passwordResets.usedAt),
				gt(passwordResets.expiresAt, new Date(now))
			)
		)
		.get();
}

/**
 * Set a new password through a link: single use (the link and every other open link of the
 * user are spent), and every session of the user ends.
 */
export async function resetPassword(
	db: Db,
	token: string,
	newPassword: string,
	now = Date.now()
): Promise<void> {
	const row = liveReset(db, token, now);
	if (!row) throw new ResetLinkError();
	// Spend the link before the slow hash, so two posts of one link cannot both succeed.
	const spent = db
		.update(passwordResets)
		.set({ usedAt: new Date(now) })
		.where(and(eq(passwordResets.id, row.id), isNull(passwordResets.usedAt)))
		.run().changes;
	if (spent !== 1) throw new ResetLinkError();
	db.update(passwordResets)
		.set({ usedAt: new Date(now) })
		.where(and(eq(passwordResets.userId, row.userId), isNull(passwordResets.usedAt)))
		.run();
	await changePassword(db, row.userId, null, newPassword, null);
}
