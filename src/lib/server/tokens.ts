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

export type CreatedToken = {
	id: number;
	name: string;
	role: Role;
	token: string;
	prefix: string;
	expiresAt: Date;
};

/** A token lives this many days unless its maker chooses otherwise. */
export const DEFAULT_TOKEN_DAYS = 90;
export const MAX_TOKEN_DAYS = 730;

/**
 * Create a token; the plain token is returned once and only its hash is stored. It expires after
 * `expiresInDays` (default 90, 1 to 730).
 */
export function createApiToken(
	db: Db,
	input: { name: string; role: Role; expiresInDays?: number },
	actor: Actor | null,
	now = Date.now()
): CreatedToken {
	const days = input.expiresInDays ?? DEFAULT_TOKEN_DAYS;
	if (!Number.isInteger(days) || days < 1 || days > MAX_TOKEN_DAYS) {
		throw new RangeError(`expiresInDays must be a whole number from 1 to ${MAX_TOKEN_DAYS}.`);
	}
	const expiresAt = new Date(now + days * 86_400_000);
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
				createdByUserId: actor?.kind === 'user' ? actor.id : null,
				expiresAt
			})
			.returning()
			.get();
		recordAudit(tx, actor, {
			action: 'create',
			entity: 'api_token',
			entityId: row.id,
			after: { name: row.name, role: row.role, prefix, expiresAt: expiresAt.toISOString() }
		});
		return { id: row.id, name: row.name, role: row.role, token, prefix, expiresAt };
	});
}

export type TokenCheck =
	| { ok: true; actor: Extract<Actor, { kind: 'token' }> }
	| { ok: false; reason: 'malformed' | 'unknown' | 'revoked' | 'expired' };

/** How often noted token use is written (at most once per this many ms). */
export const TOKEN_USE_FLUSH_MS = 30_000;
/** Token use noted in memory per database: token id → last use (epoch ms). */
const pendingUse = new Map<Db, Map<number, number>>();
let flushTimer: ReturnType<typeof setTimeout> | null = null;

/**
 * Note a token's use. A read-only request writes nothing: uses are kept in memory and written
 * together (`flushTokenUse`) at most every `TOKEN_USE_FLUSH_MS`; the token list shows them at once.
 */
function noteTokenUse(db: Db, id: number, atMs: number): void {
	let uses = pendingUse.get(db);
	if (!uses) pendingUse.set(db, (uses = new Map()));
	uses.set(id, Math.max(atMs, uses.get(id) ?? 0));
	if (flushTimer) return;
	flushTimer = setTimeout(() => {
		flushTimer = null;
		flushTokenUse();
	}, TOKEN_USE_FLUSH_MS);
	flushTimer.unref();
}

/**
 * Write noted token use in one short transaction per database. It never waits for a lock (busy
 * timeout 0 for the moment): when the database is busy the uses stay noted for the next round.
 * Never throws. Returns how many stamps were written.
 */
export function flushTokenUse(): number {
	let written = 0;
	for (const [db, uses] of pendingUse) {
		if (!db.$client.open) {
			pendingUse.delete(db);
			continue;
		}
		const timeoutMs = db.$client.pragma('busy_timeout', { simple: true }) as number;
		const entries = [...uses];
		try {
			db.$client.pragma('busy_timeout = 0');
			const stamp = db.$client.prepare(
				`update api_tokens set last_used_at = ? where id = ? and (last_used_at is null or last_used_at < ?)`
			);
			db.$client.transaction(() => {
				for (const [id, atMs] of entries) stamp.run(atMs, id, atMs);
			})();
			// Only what was written is forgotten; uses noted since stay for the next round.
			for (const [id, atMs] of entries) if (uses.get(id) === atMs) uses.delete(id);
			if (uses.size === 0) pendingUse.delete(db);
			written += entries.length;
		} catch (err) {
			console.warn('[rollbead] API token use not recorded yet (retried):', (err as Error).message);
		} finally {
			db.$client.pragma(`busy_timeout = ${timeoutMs}`);
		}
	}
	if (pendingUse.size > 0 && !flushTimer) {
		flushTimer = setTimeout(() => {
			flushTimer = null;
			flushTokenUse();
		}, TOKEN_USE_FLUSH_MS);
		flushTimer.unref();
	}
	return written;
}

/** Look a presented Bearer token up; notes when it was used (written in batches, see above). */
export function verifyApiToken(db: Db, token: string): TokenCheck {
	if (!TOKEN_PATTERN.test(token)) return { ok: false, reason: 'malformed' };
	const row = db
		.select()
		.from(apiTokens)
		.where(eq(apiTokens.tokenHash, hashToken(token)))
		.get();
	if (!row) return { ok: false, reason: 'unknown' };
	if (row.revokedAt) return { ok: false, reason: 'revoked' };
	if (row.expiresAt && row.expiresAt.getTime() <= Date.now())
		return { ok: false, reason: 'expired' };
	noteTokenUse(db, row.id, Date.now());
	return { ok: true, actor: { kind: 'token', id: row.id, name: row.name, role: row.role } };
}

export function listApiTokens(db: Db) {
	const uses = pendingUse.get(db);
	const rows = db
		.select({
			id: apiTokens.id,
			name: apiTokens.name,
			role: apiTokens.role,
			prefix: apiTokens.prefix,
			createdAt: apiTokens.createdAt,
			lastUsedAt: apiTokens.lastUsedAt,
			revokedAt: apiTokens.revokedAt,
			expiresAt: apiTokens.expiresAt
		})
		.from(apiTokens)
		.orderBy(desc(apiTokens.createdAt))
		.all();
	// Use noted but not yet written shows at once.
	for (const row of rows) {
		const atMs = uses?.get(row.id);
		if (atMs !== undefined && (!row.lastUsedAt || row.lastUsedAt.getTime() < atMs))
			row.lastUsedAt = new Date(atMs);
	}
	return rows;
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
