import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from './testing';
import { createApiToken, hashToken, revokeApiToken, verifyApiToken } from './tokens';
import { apiTokens } from './db/schema';
import type { Db } from './db';

let db: Db;
let close: () => void;
beforeEach(() => ({ db, close } = openTestDatabase()));
afterEach(() => close());

describe('API tokens', () => {
	it('keeps only the SHA-256 of the token', () => {
		const created = createApiToken(db, { name: 'spi exporter', role: 'quality' }, null);
		const row = db.select().from(apiTokens).get()!;
		expect(row.tokenHash).toBe(hashToken(created.token));
		// SHA-256 of "abc" from FIPS 180-2, appendix B.1.
		expect(hashToken('abc')).toBe(
			'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'
		);
		expect(JSON.stringify(row)).not.toContain(created.token);
	});

	it('verifies a live token as its role, and refuses revoked, unknown and malformed ones', () => {
		const created = createApiToken(db, { name: 'script', role: 'viewer' }, null);
		expect(verifyApiToken(db, created.token)).toEqual({
			ok: true,
			actor: { kind: 'token', id: created.id, name: 'script', role: 'viewer' }
		});
		expect(verifyApiToken(db, 'rb_' + 'A'.repeat(43))).toEqual({ ok: false, reason: 'unknown' });
		expect(verifyApiToken(db, 'hello')).toEqual({ ok: false, reason: 'malformed' });
		expect(revokeApiToken(db, created.id, null)).toBe(true);
		expect(revokeApiToken(db, created.id, null)).toBe(false);
		expect(verifyApiToken(db, created.token)).toEqual({ ok: false, reason: 'revoked' });
	});
});

describe('API token expiry', () => {
	it('expires after 90 days by default, or after the days chosen; an expired token is refused', () => {
		const made = Date.UTC(2026, 0, 1);
		const byDefault = createApiToken(db, { name: 'default', role: 'viewer' }, null, made);
		expect(byDefault.expiresAt.getTime() - made).toBe(90 * 86_400_000);
		const past = createApiToken(db, { name: 'old', role: 'viewer', expiresInDays: 1 }, null, made);
		// Made on 1 January 2026 with one day to live: refused now.
		expect(verifyApiToken(db, past.token)).toEqual({ ok: false, reason: 'expired' });
		const live = createApiToken(db, { name: 'live', role: 'viewer', expiresInDays: 7 }, null);
		expect(verifyApiToken(db, live.token).ok).toBe(true);
		expect(() => createApiToken(db, { name: 'x', role: 'viewer', expiresInDays: 0 }, null)).toThrow(
			RangeError
		);
		expect(() =>
			createApiToken(db, { name: 'x', role: 'viewer', expiresInDays: 1.5 }, null)
		).toThrow(RangeError);
	});
});
