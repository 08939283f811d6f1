import { and, eq, isNull } from 'drizzle-orm';
import type { Db } from '../db';
import { settings } from '../db/schema';
import { recordAudit } from '../audit';
import type { Actor } from '$lib/access';
import { thresholdsFormSchema } from '$lib/schemas/stencil-forms';
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
				.values({
					siteId: null,
					key: THRESHOLDS_SETTING_KEY,
					value: overrides,
					updatedAt: new Date()
				})
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

/** One refused threshold value: `field` is its path, e.g. `electroformed.minAreaRatio`. */
export interface ThresholdFieldError {
	field: string;
	message: string;
}

/** Either the complete, valid thresholds for every technology, or every problem found. */
export type ThresholdsCheck =
	{ thresholds: Record<StencilTechnology, PrintThresholds> } | { errors: ThresholdFieldError[] };

const LIMIT_KEYS = ['minAreaRatio', 'minAspectRatio'] as const;

/**
 * Validate a complete set of thresholds (every technology, both limits) the way the site
 * thresholds page does: each limit a number greater than 0 and at most 10.
 * @example checkSiteThresholds({ ...all, step: { minAreaRatio: 0, minAspectRatio: 1.5 } })
 * // { errors: [{ field: 'step.minAreaRatio', message: 'must be greater than 0' }] }
 */
export function checkSiteThresholds(values: unknown): ThresholdsCheck {
	const parsed = thresholdsFormSchema.safeParse(values);
	if (parsed.success) return { thresholds: parsed.data };
	return {
		errors: parsed.error.issues.map((issue) => ({
			field: issue.path.map(String).join('.'),
			message: issue.message
		}))
	};
}

const isPlainObject = (v: unknown): v is Record<string, unknown> =>
	typeof v === 'object' && v !== null && !Array.isArray(v);

/**
 * Read a `PUT /api/stencil-thresholds` body, `{"thresholds":{"<technology>":{"minAreaRatio",
 * "minAspectRatio"}}}`, over the thresholds in force: technologies and limits left out keep their
 * current values; unknown technologies or limits are refused. Field paths in the errors start at
 * the body (`thresholds.electroformed.minAreaRatio`).
 * @example thresholdsUpdate(current, { thresholds: { electroformed: { minAreaRatio: 0.55 } } })
 * // { thresholds: { ...current, electroformed: { minAreaRatio: 0.55, minAspectRatio: 1.5 } } }
 */
export function thresholdsUpdate(
	current: Record<StencilTechnology, PrintThresholds>,
	body: unknown
): ThresholdsCheck {
	if (!isPlainObject(body) || !isPlainObject(body.thresholds))
		return {
			errors: [
				{
					field: 'thresholds',
					message:
						'send {"thresholds":{"<technology>":{"minAreaRatio":…,"minAspectRatio":…}}}; ' +
						`technologies: ${STENCIL_TECHNOLOGIES.join(', ')}`
				}
			]
		};
	const errors: ThresholdFieldError[] = [];
	const merged = Object.fromEntries(
		STENCIL_TECHNOLOGIES.map((t) => [t, { ...current[t] }])
	) as Record<string, Record<string, unknown>>;
	for (const [technology, limits] of Object.entries(body.thresholds)) {
		const field = `thresholds.${technology}`;
		if (!(STENCIL_TECHNOLOGIES as readonly string[]).includes(technology)) {
			errors.push({
				field,
				message: `unknown technology; expected one of ${STENCIL_TECHNOLOGIES.join(', ')}`
			});
			continue;
		}
		if (!isPlainObject(limits)) {
			errors.push({ field, message: 'must be an object with minAreaRatio and/or minAspectRatio' });
			continue;
		}
		for (const [key, value] of Object.entries(limits)) {
			if (!(LIMIT_KEYS as readonly string[]).includes(key))
				errors.push({
					field: `${field}.${key}`,
					message: `unknown limit; expected ${LIMIT_KEYS.join(' or ')}`
				});
			else merged[technology][key] = value;
		}
	}
	const checked = checkSiteThresholds(merged);
	if ('errors' in checked)
		errors.push(...checked.errors.map((e) => ({ ...e, field: `thresholds.${e.field}` })));
	return errors.length > 0 ? { errors } : checked;
}
