import { createHash, randomBytes } from 'node:crypto';
import { and, desc, eq, isNull } from 'drizzle-orm';
import type { Db } from './db';
import { apiTokens } from './db/schema';
import { recordAudit } from './audit';
import type { Actor, Role } from '$lib/access';

/** Tokens look like `rb_` + 43 url-safe characters (256 random bits). */
const TOKEN_PATTERN = /^rb_[A-Za-z0-9_-]{43}$/;

export function hashToken(token: string): string {
	return createHash('sha256').update(token).digest('hex');
}

export type CreatedToken = { id: number; name: string; role: Role; token: string; prefix: string };

/** Create a token; the plain token is returned once and only its hash is stored. */
export function createApiToken(
	db: Db,
	input: { name: string; role: Role },
	actor: Actor | null
): CreatedToken {
	const token = 'rb_' + randomBytes(32).toString('base64url');
	const prefix = token.slice(0, 8);
	return db.transaction((tx) => {
		const row = tx
			.insert(apiTokens)
			.values({
				name: input.name,
				role: input.role,
				tokenHash: hashToken(token),
				prefix,
				createdByUserId: actor?.kind === 'user' ? actor.id : null
			})
			.returning()
			.get();
		recordAudit(tx, actor, {
			action: 'create',
			entity: 'api_token',
			entityId: row.id,
			after: { name: row.name, role: row.role, prefix }
		});
		return { id: row.id, name: row.name, role: row.role, token, prefix };
	});
}

export type TokenCheck =
	| { ok: true; actor: Extract<Actor, { kind: 'token' }> }
	| { ok: false; reason: 'malformed' | 'unknown' | 'revoked' };

/** Look a presented Bearer token up; records when it was last used. */
export function verifyApiToken(db: Db, token: string): TokenCheck {
	if (!TOKEN_PATTERN.test(token)) return { ok: false, reason: 'malformed' };
	const row = db.select().from(apiTokens).where(eq(apiTokens.tokenHash, hashToken(token))).get();
	if (!row) return { ok: false, reason: 'unknown' };
	if (row.revokedAt) return { ok: false, reason: 'revoked' };
	db.update(apiTokens).set({ lastUsedAt: new Date() }).where(eq(apiTokens.id, row.id)).run();
	return { ok: true, actor: { kind: 'token', id: row.id, name: row.name, role: row.role } };
}

export function listApiTokens(db: Db) {
	return db
		.select({
			id: apiTokens.id,
			name: apiTokens.name,
			role: apiTokens.role,
			prefix: apiTokens.prefix,
			createdAt: apiTokens.createdAt,
			lastUsedAt: apiTokens.lastUsedAt,
			revokedAt: apiTokens.revokedAt
		})
		.from(apiTokens)
		.orderBy(desc(apiTokens.createdAt))
		.all();
}

/** Revoke a token; returns false when there was no active token with that id. */
export function revokeApiToken(db: Db, id: number, actor: Actor | null): boolean {
	return db.transaction((tx) => {
		const row = tx
			.update(apiTokens)
			.set({ revokedAt: new Date() })
			.where(and(eq(apiTokens.id, id), isNull(apiTokens.revokedAt)))
			.returning()
			.get();
		if (!row) return false;
		recordAudit(tx, actor, { action: 'revoke', entity: 'api_token', entityId: id });
		return true;
	});
}
