import { and, eq, isNull } from 'drizzle-orm';
import type { Db } from '../db';
import { settings } from '../db/schema';
import { recordAudit } from '../audit';
import type { Actor } from '$lib/access';
import {
	DEFAULT_THRESHOLDS,
	STENCIL_TECHNOLOGIES,
	resolveThresholds,
	type PrintThresholds,
	type SiteThresholdOverrides,
	type StencilTechnology
} from '$lib/stencil';

/** The `settings` key under which the site's threshold overrides are kept. */
export const THRESHOLDS_SETTING_KEY = 'stencil.thresholds';

/** The site's overrides as stored (only what differs from IPC-7525 is meaningful). */
export function getThresholdOverrides(db: Pick<Db, 'select'>): SiteThresholdOverrides {
	const row = db
		.select({ value: settings.value })
		.from(settings)
		.where(and(isNull(settings.siteId), eq(settings.key, THRESHOLDS_SETTING_KEY)))
		.get();
	return (row?.value as SiteThresholdOverrides | undefined) ?? {};
}

/**
 * The thresholds in force for every technology: the IPC-7525 defaults (area ratio 0.66, aspect
 * ratio 1.5) with the site's overrides applied.
 */
export function siteThresholds(db: Pick<Db, 'select'>): Record<StencilTechnology, PrintThresholds> {
	const overrides = getThresholdOverrides(db);
	return Object.fromEntries(
		STENCIL_TECHNOLOGIES.map((t) => [t, resolveThresholds(t, overrides)])
	) as Record<StencilTechnology, PrintThresholds>;
}

/**
 * Save the site's thresholds per technology (audited). Values equal to the defaults are still
 * stored, so the page shows exactly what was saved.
 * @throws StencilInputError (from resolveThresholds) when a value is not in (0, 10].
 * @example saveSiteThresholds(db, { electroformed: { minAreaRatio: 0.5, minAspectRatio: 1.5 } }, actor)
 */
export function saveSiteThresholds(
	db: Db,
	next: Record<StencilTechnology, PrintThresholds>,
	actor: Actor | null
): Record<StencilTechnology, PrintThresholds> {
	const overrides: SiteThresholdOverrides = {};
	for (const t of STENCIL_TECHNOLOGIES) overrides[t] = { ...(next[t] ?? DEFAULT_THRESHOLDS[t]) };
	for (const t of STENCIL_TECHNOLOGIES) resolveThresholds(t, overrides); // validates
	return db.transaction((tx) => {
		const before = getThresholdOverrides(tx);
		const existing = tx
			.select({ id: settings.id })
			.from(settings)
			.where(and(isNull(settings.siteId), eq(settings.key, THRESHOLDS_SETTING_KEY)))
			.get();
		if (existing)
			tx.update(settings)
				.set({ value: overrides, updatedAt: new Date() })
				.where(eq(settings.id, existing.id))
				.run();
		else
			tx.insert(settings)
				.values({ siteId: null, key: THRESHOLDS_SETTING_KEY, value: overrides, updatedAt: new Date() })
				.run();
		recordAudit(tx, actor, {
			action: 'update',
			entity: 'setting',
			entityId: THRESHOLDS_SETTING_KEY,
			before,
			after: overrides
		});
		return siteThresholds(tx);
	});
}
