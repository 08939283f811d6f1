import { and, eq, isNull } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import { Refusal, type FieldProblem } from '$lib/errors';
import {
	DEFAULT_MIN_BASELINE_SUBGROUPS,
	isMinBaselineSubgroups,
	thresholdErrors,
	thresholdsFromStored,
	type CapabilityThresholds
} from '$lib/spc';
import type { Db } from '../db';
import { settings } from '../db/schema';
import { recordAudit } from '../audit';

const KEY = 'spc.capabilityThresholds';

/** A refused thresholds change, naming the field. */
export class ThresholdsError extends Refusal {
	readonly status = 422;
	constructor(
		readonly field: string,
		message: string
	) {
		super(message);
	}

	override get fieldProblems(): FieldProblem[] {
		return [{ field: this.field, message: this.message }];
	}
}

/** The site's capability verdict thresholds (defaults until an engineer changes them). */
export function getCapabilityThresholds(db: Db): CapabilityThresholds {
	const row = db
		.select({ value: settings.value })
		.from(settings)
		.where(and(isNull(settings.siteId), eq(settings.key, KEY)))
		.get();
	return thresholdsFromStored(row?.value);
}

/**
 * Change the thresholds (audited).
 * @throws ThresholdsError naming the first bad field.
 */
export function setCapabilityThresholds(
	db: Db,
	t: CapabilityThresholds,
	actor: Actor
): CapabilityThresholds {
	const errors = thresholdErrors(t);
	const words = {
		capable: 'Capable from',
		marginal: 'Marginal from',
		confidenceLevel: 'Confidence'
	};
	if (errors.length)
		throw new ThresholdsError(errors[0].field, `${words[errors[0].field]} ${errors[0].message}.`);
	const before = getCapabilityThresholds(db);
	db.transaction((tx) => {
		const existing = tx
			.select({ id: settings.id })
			.from(settings)
			.where(and(isNull(settings.siteId), eq(settings.key, KEY)))
			.get();
		if (existing)
			tx.update(settings)
				.set({ value: t, updatedAt: new Date() })
				.where(eq(settings.id, existing.id))
				.run();
		else
			tx.insert(settings).values({ siteId: null, key: KEY, value: t, updatedAt: new Date() }).run();
		recordAudit(tx, actor, {
			action: 'update',
			entity: 'setting',
			entityId: KEY,
			before: { ...before },
			after: { ...t }
		});
	});
	return t;
}

const BASELINE_KEY = 'spc.minBaselineSubgroups';

/** The site's fewest baseline subgroups (`DEFAULT_MIN_BASELINE_SUBGROUPS` until changed). */
export function getMinBaselineSubgroups(db: Db): number {
	const row = db
		.select({ value: settings.value })
		.from(settings)
		.where(and(isNull(settings.siteId), eq(settings.key, BASELINE_KEY)))
		.get();
	const v = row?.value;
	return isMinBaselineSubgroups(v) ? v : DEFAULT_MIN_BASELINE_SUBGROUPS;
}

/** @throws ThresholdsError unless a whole number 10–200. */
export function setMinBaselineSubgroups(db: Db, n: number, actor: Actor): number {
	if (!isMinBaselineSubgroups(n)) {
		throw new ThresholdsError(
			'minBaselineSubgroups',
			'Subgroups to freeze limits must be a whole number from 10 to 200.'
		);
	}
	const before = getMinBaselineSubgroups(db);
	db.transaction((tx) => {
		const existing = tx
			.select({ id: settings.id })
			.from(settings)
			.where(and(isNull(settings.siteId), eq(settings.key, BASELINE_KEY)))
			.get();
		if (existing)
			tx.update(settings)
				.set({ value: n, updatedAt: new Date() })
				.where(eq(settings.id, existing.id))
				.run();
		else
			tx.insert(settings)
				.values({ siteId: null, key: BASELINE_KEY, value: n, updatedAt: new Date() })
				.run();
		recordAudit(tx, actor, {
			action: 'update',
			entity: 'setting',
			entityId: BASELINE_KEY,
			before: { value: before },
			after: { value: n }
		});
	});
	return n;
}
