import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { openTestDatabase } from './testing';
import {
	authenticate,
	createUser,
	DuplicateEmailError,
	recordSignInFailure,
	signInLockMinutes,
	SIGN_IN_WINDOW_MS,
	updateUser,
	changePassword,
	countActiveAdmins,
	LastAdminError,
	pruneSignInFailures,
	WrongPasswordError
} from './users';
import { auditLog, signInFailures, users } from './db/schema';
import type { Db } from './db';

let db: Db;
let close: () => void;
beforeEach(() => ({ db, close } = openTestDatabase()));
afterEach(() => close());

const alice = {
	email: 'Alice@Fenmoor.example ',
	name: 'Alice',
	role: 'engineer' as const,
	password: 'correct horse'
};

describe('users', () => {
	it('stores an argon2id hash, never the password, and normalises the e-mail', async () => {
		const user = await createUser(db, alice, null);
		expect(user.email).toBe('alice@fenmoor.example');
		const row = db.select().from(users).get()!;
		expect(row.passwordHash).toMatch(/^\$argon2id\$/);
		expect(row.passwordHash).not.toContain('correct horse');
	});

	it('authenticates the right password only, and never an inactive user', async () => {
		const user = await createUser(db, alice, null);
		expect((await authenticate(db, 'ALICE@fenmoor.example', 'correct horse'))?.id).toBe(user.id);
		expect(await authenticate(db, 'alice@fenmoor.example', 'wrong')).toBeNull();
		expect(await authenticate(db, 'nobody@fenmoor.example', 'correct horse')).toBeNull();
		updateUser(db, user.id, { active: false }, null);
		expect(await authenticate(db, 'alice@fenmoor.example', 'correct horse')).toBeNull();
	});

	it('refuses a second user with the same e-mail and leaves the first intact', async () => {
		await createUser(db, alice, null);
		await expect(createUser(db, { ...alice, name: 'Other' }, null)).rejects.toBeInstanceOf(
			DuplicateEmailError
		);
		expect(
			db
				.select({ n: sql<number>`count(*)` })
				.from(users)
				.get()!.n
		).toBe(1);
	});

	it('audits creation and role changes with before and after', async () => {
		const user = await createUser(db, alice, null);
		updateUser(
			db,
			user.id,
			{ role: 'quality' },
			{ kind: 'user', id: user.id, email: 'a', name: 'A', role: 'admin' }
		);
		const entries = db.select().from(auditLog).all();
		expect(entries.map((e) => e.action)).toEqual(['create', 'update']);
		expect(entries[1]).toMatchObject({
			actor: `user:${user.id}`,
			entity: 'user',
			before: { role: 'engineer', active: true },
			after: { role: 'quality', active: true }
		});
	});
});

describe('sign-in throttle', () => {
	it.each([
		{ failures: 4, locked: false },
		{ failures: 5, locked: true },
		{ failures: 7, locked: true }
	])('$failures failures within 15 minutes: locked=$locked', ({ failures, locked }) => {
		for (let i = 0; i < failures; i++) recordSignInFailure(db, 'a@x.example', '10.0.0.1');
		expect(signInLockMinutes(db, 'a@x.example', '10.0.0.1') > 0).toBe(locked);
		// Another address or another account is not affected.
		expect(signInLockMinutes(db, 'a@x.example', '10.0.0.2')).toBe(0);
		expect(signInLockMinutes(db, 'b@x.example', '10.0.0.1')).toBe(0);
	});

	it('unlocks 15 minutes after the fifth-latest failure', () => {
		const start = Date.now();
		for (let i = 0; i < 5; i++) {
			db.insert(signInFailures)
				.values({ email: 'a@x.example', ip: 'ip', at: new Date(start + i * 1000) })
				.run();
		}
		expect(signInLockMinutes(db, 'a@x.example', 'ip', start + 5000)).toBe(15);
		expect(signInLockMinutes(db, 'a@x.example', 'ip', start + SIGN_IN_WINDOW_MS - 1)).toBe(1);
		expect(signInLockMinutes(db, 'a@x.example', 'ip', start + SIGN_IN_WINDOW_MS + 1)).toBe(0);
	});
});

describe('least privilege and account safety', () => {
	it('never lets the last active administrator be demoted or deactivated', async () => {
		const root = await createUser(
			db,
			{ ...alice, email: 'root@fenmoor.example', role: 'admin' },
			null
		);
		expect(() => updateUser(db, root.id, { role: 'engineer' }, null)).toThrow(LastAdminError);
		expect(() => updateUser(db, root.id, { active: false }, null)).toThrow(LastAdminError);
		const second = await createUser(
			db,
			{ ...alice, email: 'two@fenmoor.example', role: 'admin' },
			null
		);
		expect(updateUser(db, root.id, { role: 'engineer' }, null)?.role).toBe('engineer');
		expect(countActiveAdmins(db)).toBe(1);
		expect(() => updateUser(db, second.id, { active: false }, null)).toThrow(LastAdminError);
		// An inactive administrator does not count and may be changed freely.
		expect(updateUser(db, second.id, { role: 'admin' }, null)?.role).toBe('admin');
	});

	it('changes a password only with the current one, and audits it', async () => {
		const user = await createUser(db, alice, null);
		await expect(changePassword(db, user.id, 'wrong', 'new long password', null)).rejects.toThrow(
			WrongPasswordError
		);
		await changePassword(db, user.id, 'correct horse', 'new long password', null);
		expect(await authenticate(db, alice.email, 'correct horse')).toBeNull();
		expect((await authenticate(db, alice.email, 'new long password'))?.id).toBe(user.id);
		const actions = db
			.select()
			.from(auditLog)
			.all()
			.map((a) => a.action);
		expect(actions).toContain('password-change');
	});

	it('prunes sign-in failures older than the throttle window', () => {
		const now = Date.UTC(2026, 4, 1, 12);
		recordSignInFailure(db, 'a@fenmoor.example', '10.0.0.1', now - SIGN_IN_WINDOW_MS - 1000);
		recordSignInFailure(db, 'a@fenmoor.example', '10.0.0.1', now - 60_000);
		expect(pruneSignInFailures(db, now)).toBe(1);
		expect(db.select().from(signInFailures).all()).toHaveLength(1);
		// Recording a failure prunes as well.
		recordSignInFailure(db, 'b@fenmoor.example', '10.0.0.2', now + SIGN_IN_WINDOW_MS);
		expect(
			db
				.select()
				.from(signInFailures)
				.all()
				.map((r) => r.email)
		).toEqual(['b@fenmoor.example']);
	});
});
