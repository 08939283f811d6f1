import { and, asc, eq, gt, lt, sql } from 'drizzle-orm';
import type { Db } from './db';
import { signInFailures, users } from './db/schema';
import { hashPassword, verifyPassword } from './passwords';
import { recordAudit } from './audit';
import { endUserSessions, sessionTimeouts, sessionUserId } from './sessions';
import type { Actor, Role } from '$lib/access';
import { Refusal } from '$lib/errors';

export type UserSummary = {
	id: number;
	email: string;
	name: string;
	role: Role;
	active: boolean;
	createdAt: Date;
};

const summaryColumns = {
	id: users.id,
	email: users.email,
	name: users.name,
	role: users.role,
	active: users.active,
	createdAt: users.createdAt
};

export function listUsers(db: Db): UserSummary[] {
	return db.select(summaryColumns).from(users).orderBy(asc(users.name)).all();
}

export function findUser(db: Db, id: number): UserSummary | undefined {
	return db.select(summaryColumns).from(users).where(eq(users.id, id)).get();
}

export function findActiveUser(db: Db, id: number): UserSummary | undefined {
	return db
		.select(summaryColumns)
		.from(users)
		.where(and(eq(users.id, id), eq(users.active, true)))
		.get();
}

/**
 * The active user a session id belongs to, or undefined when the session was ended, timed out, or
 * its user is gone or deactivated (see sessions.ts for the session rules).
 */
export function userForSession(
	db: Db,
	sessionId: unknown,
	now = Date.now(),
	timeouts = sessionTimeouts()
): UserSummary | undefined {
	const userId = sessionUserId(db, sessionId, now, timeouts);
	return userId === undefined ? undefined : findActiveUser(db, userId);
}

export class DuplicateEmailError extends Refusal {
	readonly status = 409;
	constructor(email: string) {
		super(`A user with the e-mail ${email} already exists.`);
	}
}

/** Create a user; the password is hashed before the single insert, so no half-created user. */
export async function createUser(
	db: Db,
	input: { email: string; name: string; role: Role; password: string },
	actor: Actor | null
): Promise<UserSummary> {
	const email = input.email.trim().toLowerCase();
	const passwordHash = await hashPassword(input.password);
	return db.transaction((tx) => {
		const existing = tx.select({ id: users.id }).from(users).where(eq(users.email, email)).get();
		if (existing) throw new DuplicateEmailError(email);
		const row = tx
			.insert(users)
			.values({ email, name: input.name.trim(), role: input.role, passwordHash })
			.returning(summaryColumns)
			.get();
		recordAudit(tx, actor, {
			action: 'create',
			entity: 'user',
			entityId: row.id,
			after: { email: row.email, name: row.name, role: row.role }
		});
		return row;
	});
}

/** Refused: the change would leave no active administrator. */
export class LastAdminError extends Refusal {
	readonly status = 409;
	constructor() {
		super('This is the last active administrator; make someone else an administrator first.');
	}
}

/**
 * Change role or active flag; nothing is ever hard-deleted. A change of either ends the user's
 * sessions at once (they sign in again with the new role, or not at all). The last active
 * administrator cannot be demoted or deactivated (LastAdminError), checked in the same
 * transaction as the change.
 */
export function updateUser(
	db: Db,
	id: number,
	change: { role?: Role; active?: boolean },
	actor: Actor | null
): UserSummary | undefined {
	return db.transaction((tx) => {
		const before = tx.select(summaryColumns).from(users).where(eq(users.id, id)).get();
		if (!before) return undefined;
		const losesAdmin =
			before.role === 'admin' &&
			before.active &&
			((change.role !== undefined && change.role !== 'admin') || change.active === false);
		if (losesAdmin && countActiveAdmins(tx) <= 1) throw new LastAdminError();
		const roleChanged = change.role !== undefined && change.role !== before.role;
		const activeChanged = change.active !== undefined && change.active !== before.active;
		if (roleChanged || activeChanged) endUserSessions(tx, id);
		const after = tx
			.update(users)
			.set({ ...change, updatedAt: new Date() })
			.where(eq(users.id, id))
			.returning(summaryColumns)
			.get();
		recordAudit(tx, actor, {
			action: 'update',
			entity: 'user',
			entityId: id,
			before: { role: before.role, active: before.active },
			after: { role: after.role, active: after.active }
		});
		return after;
	});
}

export function countActiveAdmins(db: Pick<Db, 'select'>): number {
	return (
		db
			.select({ n: sql<number>`count(*)` })
			.from(users)
			.where(and(eq(users.role, 'admin'), eq(users.active, true)))
			.get()?.n ?? 0
	);
}

/**
 * An argon2id hash of a random password with the same parameters as real ones: unknown and
 * inactive accounts are checked against it, so sign-in does the same work (and takes as long)
 * whether or not the account exists.
 */
export const DUMMY_PASSWORD_HASH =
	'$argon2id$v=19$m=19456,t=2,p=1$sxvOl9N7IMM8j3KoX1FufA$6Z/dcUi7dvYCnEsKUmFlzN7cYnCgPwCtrluWZOsu7yM';

/** Check a password; returns the active user or null (unknown, inactive and wrong look alike). */
export async function authenticate(
	db: Db,
	emailInput: string,
	password: string
): Promise<UserSummary | null> {
	const email = emailInput.trim().toLowerCase();
	const row = db.select().from(users).where(eq(users.email, email)).get();
	const usable = !!row && row.active;
	const matches = await verifyPassword(usable ? row.passwordHash : DUMMY_PASSWORD_HASH, password);
	if (!usable || !matches) return null;
	const { passwordHash: _omit, updatedAt: _u, ...summary } = row;
	return summary;
}

export const SIGN_IN_WINDOW_MS = 15 * 60 * 1000;
export const SIGN_IN_MAX_FAILURES = 5;

/** Minutes until the account may try again from this address, or 0 when it is not throttled. */
export function signInLockMinutes(
	db: Db,
	emailInput: string,
	ip: string,
	now = Date.now()
): number {
	const email = emailInput.trim().toLowerCase();
	const recent = db
		.select({ at: signInFailures.at })
		.from(signInFailures)
		.where(
			and(
				eq(signInFailures.email, email),
				eq(signInFailures.ip, ip),
				gt(signInFailures.at, new Date(now - SIGN_IN_WINDOW_MS))
			)
		)
		.orderBy(asc(signInFailures.at))
		.all();
	if (recent.length < SIGN_IN_MAX_FAILURES) return 0;
	const unlockAt = recent[recent.length - SIGN_IN_MAX_FAILURES].at.getTime() + SIGN_IN_WINDOW_MS;
	return Math.max(1, Math.ceil((unlockAt - now) / 60000));
}

export function recordSignInFailure(
	db: Db,
	emailInput: string,
	ip: string,
	now = Date.now()
): void {
	pruneSignInFailures(db, now);
	db.insert(signInFailures)
		.values({ email: emailInput.trim().toLowerCase(), ip, at: new Date(now) })
		.run();
}

/** Failures older than the throttle window no longer count for anything: drop them. */
export function pruneSignInFailures(db: Db, now = Date.now()): number {
	return db
		.delete(signInFailures)
		.where(lt(signInFailures.at, new Date(now - SIGN_IN_WINDOW_MS)))
		.run().changes;
}

export class WrongPasswordError extends Refusal {
	readonly status = 422;
	constructor() {
		super('The current password is wrong.');
	}
}

/**
 * Set a new password (own account: `currentPassword` must match; reset link: null). Every session
 * of the user ends, including the one that made the change.
 */
export async function changePassword(
	db: Db,
	userId: number,
	currentPassword: string | null,
	newPassword: string,
	actor: Actor | null
): Promise<void> {
	const row = db.select().from(users).where(eq(users.id, userId)).get();
	if (!row) throw new WrongPasswordError();
	if (currentPassword !== null && !(await verifyPassword(row.passwordHash, currentPassword))) {
		throw new WrongPasswordError();
	}
	const passwordHash = await hashPassword(newPassword);
	db.transaction((tx) => {
		tx.update(users).set({ passwordHash, updatedAt: new Date() }).where(eq(users.id, userId)).run();
		endUserSessions(tx, userId);
		recordAudit(tx, actor, {
			action: currentPassword === null ? 'password-reset' : 'password-change',
			entity: 'user',
			entityId: userId
		});
	});
}

export function findUserByEmail(db: Db, emailInput: string): UserSummary | undefined {
	return db
		.select(summaryColumns)
		.from(users)
		.where(eq(users.email, emailInput.trim().toLowerCase()))
		.get();
}

export function clearSignInFailures(db: Db, emailInput: string, ip: string): void {
	db.delete(signInFailures)
		.where(
			and(eq(signInFailures.email, emailInput.trim().toLowerCase()), eq(signInFailures.ip, ip))
		)
		.run();
}
