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
		expect(hashToken('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
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
