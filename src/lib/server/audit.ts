import type { Db } from './db';
import { auditLog } from './db/schema';
import type { Actor } from '$lib/access';

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
	entry: { action: string; entity: string; entityId?: string | number | null; before?: AuditSnapshot; after?: AuditSnapshot }
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
