import { and, asc, eq, gt, sql } from 'drizzle-orm';
import type { Db } from './db';
import { signInFailures, users } from './db/schema';
import { hashPassword, verifyPassword } from './passwords';
import { recordAudit } from './audit';
import type { Actor, Role } from '$lib/access';

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

export function findActiveUser(db: Db, id: number): UserSummary | undefined {
	return db
		.select(summaryColumns)
		.from(users)
		.where(and(eq(users.id, id), eq(users.active, true)))
		.get();
}

export class DuplicateEmailError extends Error {
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

/** Change role or active flag; nothing is ever hard-deleted. */
export function updateUser(
	db: Db,
	id: number,
	change: { role?: Role; active?: boolean },
	actor: Actor | null
): UserSummary | undefined {
	return db.transaction((tx) => {
		const before = tx.select(summaryColumns).from(users).where(eq(users.id, id)).get();
		if (!before) return undefined;
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

export function countActiveAdmins(db: Db): number {
	return (
		db
			.select({ n: sql<number>`count(*)` })
			.from(users)
			.where(and(eq(users.role, 'admin'), eq(users.active, true)))
			.get()?.n ?? 0
	);
}

/** Check a password; returns the active user or null (unknown, inactive and wrong look alike). */
export async function authenticate(
	db: Db,
	emailInput: string,
	password: string
): Promise<UserSummary | null> {
	const email = emailInput.trim().toLowerCase();
	const row = db.select().from(users).where(eq(users.email, email)).get();
	if (!row || !row.active) return null;
	if (!(await verifyPassword(row.passwordHash, password))) return null;
	const { passwordHash: _omit, updatedAt: _u, ...summary } = row;
	return summary;
}

export const SIGN_IN_WINDOW_MS = 15 * 60 * 1000;
export const SIGN_IN_MAX_FAILURES = 5;

/** Minutes until the account may try again from this address, or 0 when it is not throttled. */
export function signInLockMinutes(db: Db, emailInput: string, ip: string, now = Date.now()): number {
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

export function recordSignInFailure(db: Db, emailInput: string, ip: string): void {
	db.insert(signInFailures)
		.values({ email: emailInput.trim().toLowerCase(), ip, at: new Date() })
		.run();
}

export function clearSignInFailures(db: Db, emailInput: string, ip: string): void {
	db.delete(signInFailures)
		.where(and(eq(signInFailures.email, emailInput.trim().toLowerCase()), eq(signInFailures.ip, ip)))
		.run();
}
