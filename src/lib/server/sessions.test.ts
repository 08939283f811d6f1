import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from './testing';
import {
	countUserSessions,
	createSession,
	endSession,
	endUserSessions,
	sessionTimeouts
} from './sessions';
import { changePassword, createUser, updateUser, userForSession } from './users';
import { sessions } from './db/schema';
import type { Db } from './db';

let db: Db;
let close: () => void;
beforeEach(() => ({ db, close } = openTestDatabase()));
afterEach(() => close());

const T = { idleMs: 30 * 60_000, absoluteMs: 8 * 3_600_000 };
const person = (role: 'admin' | 'engineer' = 'engineer', email = 'ida@fenmoor.example') =>
	createUser(db, { email, name: 'Ida', role, password: 'a long password' }, null);

describe('server-side sessions', () => {
	it('keeps only a hash of the session id and finds the active user by it', async () => {
		const user = await person();
		const id = createSession(db, user.id);
		expect(JSON.stringify(db.select().from(sessions).all())).not.toContain(id);
		expect(userForSession(db, id)?.id).toBe(user.id);
		expect(userForSession(db, id + 'x')).toBeUndefined();
		expect(userForSession(db, undefined)).toBeUndefined();
	});

	it('ends a session at sign-out; others of the same user go on', async () => {
		const user = await person();
		const a = createSession(db, user.id);
		const b = createSession(db, user.id);
		endSession(db, a);
		expect(userForSession(db, a)).toBeUndefined();
		expect(userForSession(db, b)?.id).toBe(user.id);
		expect(endUserSessions(db, user.id)).toBe(1);
		expect(userForSession(db, b)).toBeUndefined();
	});

	it('times out when idle, and after the absolute limit even when busy', async () => {
		const user = await person();
		const t0 = Date.UTC(2026, 2, 1, 6);
		const idle = createSession(db, user.id, t0);
		expect(userForSession(db, idle, t0 + T.idleMs - 1000, T)?.id).toBe(user.id);
		expect(userForSession(db, idle, t0 + 2 * T.idleMs, T)).toBeUndefined();

		const busy = createSession(db, user.id, t0);
		// A request every 20 minutes keeps it from idling, but not past 8 hours.
		for (let t = t0; t < t0 + T.absoluteMs; t += 20 * 60_000) {
			expect(userForSession(db, busy, t, T)?.id).toBe(user.id);
		}
		expect(userForSession(db, busy, t0 + T.absoluteMs + 60_000, T)).toBeUndefined();
	});

	it('reads the timeouts from the environment, ignoring typos', () => {
		expect(sessionTimeouts({ SESSION_IDLE_MINUTES: '15', SESSION_MAX_HOURS: '10' })).toEqual({
			idleMs: 15 * 60_000,
			absoluteMs: 10 * 3_600_000
		});
		expect(sessionTimeouts({ SESSION_IDLE_MINUTES: 'ten', SESSION_MAX_HOURS: '-1' })).toEqual({
			idleMs: 120 * 60_000,
			absoluteMs: 12 * 3_600_000
		});
	});

	it('a role change, a deactivation and a password change end every session of that user', async () => {
		const admin = await person('admin', 'root@fenmoor.example');
		const user = await person();
		const other = createSession(db, admin.id);

		let s = createSession(db, user.id);
		updateUser(db, user.id, { role: 'viewer' }, null);
		expect(userForSession(db, s)).toBeUndefined();

		s = createSession(db, user.id);
		updateUser(db, user.id, { role: 'viewer' }, null); // no change: the session stays
		expect(userForSession(db, s)?.id).toBe(user.id);
		updateUser(db, user.id, { active: false }, null);
		expect(userForSession(db, s)).toBeUndefined();
		updateUser(db, user.id, { active: true }, null);

		s = createSession(db, user.id);
		await changePassword(db, user.id, 'a long password', 'another long password', null);
		expect(userForSession(db, s)).toBeUndefined();
		expect(countUserSessions(db, user.id)).toBe(0);
		expect(userForSession(db, other)?.id).toBe(admin.id);
	});
});
