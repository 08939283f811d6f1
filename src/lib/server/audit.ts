import { and, count, desc, eq, gte, inArray, lte, type SQL } from 'drizzle-orm';
import type { Db } from './db';
import { apiTokens, auditLog, users } from './db/schema';
import type { Actor } from '$lib/access';
import { boundsOf, type AuditQuery } from '$lib/schemas/audit';
import { writeCsv, type CsvCell } from '$lib/csv/write-csv';

/** A plain-JSON snapshot of an entity for the audit trail (dates as ISO strings). */
export type AuditSnapshot = Record<string, unknown> | null;

export function actorLabel(actor: Actor | null): string {
	if (!actor) return 'system';
	return `${actor.kind}:${actor.id}`;
}

/**
 * Record who changed what. Call inside the same transaction as the change itself, so the
 * trail and the data can never disagree.
 */
export function recordAudit(
	db: Pick<Db, 'insert'>,
	actor: Actor | null,
	entry: {
		action: string;
		entity: string;
		entityId?: string | number | null;
		before?: AuditSnapshot;
		after?: AuditSnapshot;
	}
): void {
	db.insert(auditLog)
		.values({
			actor: actorLabel(actor),
			userId: actor?.kind === 'user' ? actor.id : null,
			action: entry.action,
			entity: entry.entity,
			entityId: entry.entityId == null ? null : String(entry.entityId),
			before: entry.before ?? null,
			after: entry.after ?? null
		})
		.run();
}

/** One audit entry as the page, the API and the CSV show it. */
export type AuditEntry = {
	id: number;
	at: Date;
	/** "user:12", "token:3" or "system". */
	actor: string;
	/** The person's or token's name, when known. */
	actorName: string | null;
	userId: number | null;
	action: string;
	/** What kind of record changed ("user", "stencil", "print_run" …). */
	kind: string;
	recordId: string | null;
	before: unknown;
	after: unknown;
};

export const AUDIT_PAGE_SIZE = 50;
/** The CSV holds at most this many entries (newest first); narrow the filters for older ones. */
export const AUDIT_CSV_MAX_ROWS = 20_000;

function whereOf(q: AuditQuery): SQL | undefined {
	const parts: SQL[] = [];
	if (q.user !== undefined) parts.push(eq(auditLog.userId, q.user));
	if (q.kind !== undefined) parts.push(eq(auditLog.entity, q.kind));
	if (q.from !== undefined) parts.push(gte(auditLog.at, new Date(boundsOf(q.from, 'from'))));
	if (q.to !== undefined) parts.push(lte(auditLog.at, new Date(boundsOf(q.to, 'to'))));
	return parts.length ? and(...parts) : undefined;
}

function withNames(
	db: Db,
	rows: (typeof auditLog.$inferSelect & { userName: string | null })[]
): AuditEntry[] {
	const tokenIds = [
		...new Set(
			rows.filter((r) => r.actor.startsWith('token:')).map((r) => Number(r.actor.slice(6)))
		)
	].filter(Number.isSafeInteger);
	const tokenNames = new Map(
		tokenIds.length
			? db
					.select({ id: apiTokens.id, name: apiTokens.name })
					.from(apiTokens)
					.where(inArray(apiTokens.id, tokenIds))
					.all()
					.map((t) => [t.id, t.name])
			: []
	);
	return rows.map((r) => ({
		id: r.id,
		at: r.at,
		actor: r.actor,
		actorName:
			r.userName ??
			(r.actor.startsWith('token:') ? (tokenNames.get(Number(r.actor.slice(6))) ?? null) : null),
		userId: r.userId,
		action: r.action,
		kind: r.entity,
		recordId: r.entityId,
		before: r.before,
		after: r.after
	}));
}

function selectEntries(db: Db, q: AuditQuery) {
	return db
		.select({
			id: auditLog.id,
			at: auditLog.at,
			actor: auditLog.actor,
			userId: auditLog.userId,
			action: auditLog.action,
			entity: auditLog.entity,
			entityId: auditLog.entityId,
			before: auditLog.before,
			after: auditLog.after,
			userName: users.name
		})
		.from(auditLog)
		.leftJoin(users, eq(users.id, auditLog.userId))
		.where(whereOf(q))
		.orderBy(desc(auditLog.at), desc(auditLog.id));
}

/** A page of the audit trail, newest first, with the total that matches the filters. */
export function listAudit(db: Db, q: AuditQuery) {
	const pageSize = q.pageSize ?? AUDIT_PAGE_SIZE;
	const page = q.page ?? 1;
	const total = db.select({ n: count() }).from(auditLog).where(whereOf(q)).get()?.n ?? 0;
	const rows = selectEntries(db, q)
		.limit(pageSize)
		.offset((page - 1) * pageSize)
		.all();
	return {
		entries: withNames(db, rows),
		page,
		pageSize,
		total,
		pages: Math.max(1, Math.ceil(total / pageSize))
	};
}

/** Kinds of record in the trail, and the people who acted, for the filter lists. */
export function auditFilterChoices(db: Db) {
	const kinds = db
		.selectDistinct({ kind: auditLog.entity })
		.from(auditLog)
		.orderBy(auditLog.entity)
		.all()
		.map((r) => r.kind);
	const people = db
		.select({ id: users.id, name: users.name })
		.from(users)
		.orderBy(users.name)
		.all();
	return { kinds, people };
}

export const AUDIT_CSV_HEADER = [
	'id',
	'at',
	'actor',
	'actor_name',
	'action',
	'kind',
	'record_id',
	'before',
	'after'
];

/** The filtered trail as CSV through the one writer (before/after as JSON text). */
export function auditCsv(db: Db, q: AuditQuery): string {
	const rows = withNames(db, selectEntries(db, q).limit(AUDIT_CSV_MAX_ROWS).all());
	const json = (v: unknown) => (v === null || v === undefined ? null : JSON.stringify(v));
	return writeCsv([
		AUDIT_CSV_HEADER,
		...rows.map((e): CsvCell[] => [
			e.id,
			e.at,
			e.actor,
			e.actorName,
			e.action,
			e.kind,
			e.recordId,
			json(e.before),
			json(e.after)
		])
	]);
}
