import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { openTestDatabase } from './testing';
import { createApiToken, flushTokenUse, listApiTokens, verifyApiToken } from './tokens';
import type { Db } from './db';

let db: Db;
let close: () => void;
beforeEach(() => ({ db, close } = openTestDatabase()));
afterEach(() => close());

const storedLastUse = (id: number) =>
	db.$client.prepare(`select last_used_at from api_tokens where id = ?`).pluck().get(id) as
		number | null;

describe('API token use stamps', () => {
	it('a request with a token writes nothing; the use is listed at once and written in a batch', () => {
		const made = createApiToken(db, { name: 'exporter', role: 'viewer' }, null);
		const changesBefore = db.$client.prepare('select total_changes()').pluck().get() as number;
		const before = Date.now();
		expect(verifyApiToken(db, made.token).ok).toBe(true);
		expect(verifyApiToken(db, made.token).ok).toBe(true);
		expect(db.$client.prepare('select total_changes()').pluck().get()).toBe(changesBefore);
		expect(storedLastUse(made.id)).toBeNull();
		const listed = listApiTokens(db).find((t) => t.id === made.id);
		expect(listed?.lastUsedAt?.getTime()).toBeGreaterThanOrEqual(before);
		expect(flushTokenUse()).toBeGreaterThanOrEqual(1);
		expect(storedLastUse(made.id)).toBe(listed?.lastUsedAt?.getTime());
	});

	it('never waits for a locked database: the stamp stays noted and is written on a later round', () => {
		const made = createApiToken(db, { name: 'exporter', role: 'viewer' }, null);
		// Another connection holds the write lock (as a long writer in another process would).
		const other = new Database(db.$client.name);
		other.exec('BEGIN IMMEDIATE');
		try {
			expect(verifyApiToken(db, made.token).ok).toBe(true);
			flushTokenUse();
			expect(storedLastUse(made.id)).toBeNull();
		} finally {
			other.exec('ROLLBACK');
			other.close();
		}
		flushTokenUse();
		expect(storedLastUse(made.id)).not.toBeNull();
		// The connection's own busy timeout is as it was.
		expect(db.$client.pragma('busy_timeout', { simple: true })).toBeGreaterThan(0);
	});
});
