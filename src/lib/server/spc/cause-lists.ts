import { and, eq, isNull } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import type { Db } from '../db';
import { settings } from '../db/schema';
import { recordAudit } from '../audit';
import { cleanList, DEFAULT_CAUSE_LISTS, type CauseLists } from '$lib/spc';

export { DEFAULT_CAUSE_LISTS, type CauseLists };

const KEYS = { causes: 'spc.assignableCauses', actions: 'spc.correctiveActions' } as const;

function read(db: Db, key: string): string[] | null {
	const row = db
		.select({ value: settings.value })
		.from(settings)
		.where(and(isNull(settings.siteId), eq(settings.key, key)))
		.get();
	return Array.isArray(row?.value) ? (row.value as unknown[]).map(String) : null;
}

/** The current lists (defaults until the site edits them). */
export function getCauseLists(db: Db): CauseLists {
	return {
		causes: read(db, KEYS.causes) ?? DEFAULT_CAUSE_LISTS.causes,
		actions: read(db, KEYS.actions) ?? DEFAULT_CAUSE_LISTS.actions
	};
}

/**
 * Replace one list (audited). Past acknowledgements keep the text they chose.
 * @throws Error when the cleaned list is empty.
 */
export function setCauseList(
	db: Db,
	which: keyof CauseLists,
	entries: readonly string[],
	actor: Actor | null
): string[] {
	const list = cleanList(entries);
	if (list.length === 0) throw new Error(`The list of ${which} needs at least one entry.`);
	const before = getCauseLists(db)[which];
	db.transaction((tx) => {
		const existing = tx
			.select({ id: settings.id })
			.from(settings)
			.where(and(isNull(settings.siteId), eq(settings.key, KEYS[which])))
			.get();
		if (existing) {
			tx.update(settings)
				.set({ value: list, updatedAt: new Date() })
				.where(eq(settings.id, existing.id))
				.run();
		} else {
			tx.insert(settings)
				.values({ siteId: null, key: KEYS[which], value: list, updatedAt: new Date() })
				.run();
		}
		recordAudit(tx, actor, {
			action: 'update',
			entity: 'setting',
			entityId: KEYS[which],
			before: { list: before },
			after: { list }
		});
	});
	return list;
}
