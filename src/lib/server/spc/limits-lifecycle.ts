import { and, eq } from 'drizzle-orm';
import { baselineLimits, exclusionReason, LimitsError } from '$lib/spc';
import type { Actor } from '$lib/access';
import type { Db } from '../db';
import { spcExclusions, spcLimitVersions } from '../db/schema';
import { recordAudit } from '../audit';
import { loadSubgroups } from './chart-source';
import { getMinBaselineSubgroups } from './capability-settings';
import {
	getCharacteristic,
	latestLimitVersion,
	listExclusions,
	type LimitVersionSummary
} from './chart-service';

export { LimitsError };

/** Options of `freezeLimits`: the Phase I baseline period and a note for the history. */
export interface FreezeOptions {
	baselineFrom?: Date | null;
	baselineTo?: Date | null;
	note?: string;
	/** Newest subgroups considered (as on the chart page); default 200. */
	limit?: number;
	/** Fewest baseline subgroups; default the site setting (20). */
	minSubgroups?: number;
}

/**
 * Phase I → II: compute limits from the baseline (period, minus excluded points) and store them
 * as the next numbered version (audited). New data is then judged against them; a later
 * recalculation stores another version, never changing this one.
 * @throws LimitsError when the baseline has fewer subgroups than the minimum (default 20, a
 *   site setting), too little data or no variation.
 */
export function freezeLimits(
	db: Db,
	id: number,
	options: FreezeOptions,
	actor: Actor | null
): LimitVersionSummary {
	const c = getCharacteristic(db, id);
	const subgroups = loadSubgroups(db, c, Math.max(1, Math.min(5000, options.limit ?? 200)));
	const { limits, baselinePoints, baselineFrom, baselineTo, excluded } = baselineLimits(
		c,
		subgroups,
		listExclusions(db, id),
		options,
		options.minSubgroups ?? getMinBaselineSubgroups(db)
	);
	const row = db.transaction((tx) => {
		const next = (latestLimitVersion(tx as unknown as Db, id)?.version ?? 0) + 1;
		const inserted = tx
			.insert(spcLimitVersions)
			.values({
				characteristicId: id,
				version: next,
				limits: limits as unknown as Record<string, unknown>,
				baselineFrom,
				baselineTo,
				baselinePoints,
				excluded,
				note: (options.note ?? '').slice(0, 500),
				createdByUserId: actor?.kind === 'user' ? actor.id : null
			})
			.returning()
			.get();
		recordAudit(tx, actor, {
			action: next === 1 ? 'freeze-limits' : 'recalculate-limits',
			entity: 'spc-characteristic',
			entityId: id,
			after: { version: next, limits: { ...limits }, baselinePoints, excluded }
		});
		return inserted;
	});
	return {
		id: row.id,
		version: row.version,
		createdAt: row.createdAt,
		createdBy: actor?.name ?? null,
		baselinePoints: row.baselinePoints,
		baselineFrom: row.baselineFrom,
		baselineTo: row.baselineTo,
		excluded: row.excluded,
		note: row.note,
		limits
	};
}

/**
 * Leave a point out of the next baseline, with the reason (audited).
 * @throws LimitsError without a reason.
 */
export function excludePoint(
	db: Db,
	id: number,
	pointKey: string,
	reason: string,
	actor: Actor | null
): void {
	getCharacteristic(db, id);
	const why = exclusionReason(pointKey, reason);
	db.transaction((tx) => {
		tx.insert(spcExclusions)
			.values({
				characteristicId: id,
				pointKey,
				reason: why.slice(0, 500),
				createdByUserId: actor?.kind === 'user' ? actor.id : null
			})
			.onConflictDoUpdate({
				target: [spcExclusions.characteristicId, spcExclusions.pointKey],
				set: { reason: why.slice(0, 500) }
			})
			.run();
		recordAudit(tx, actor, {
			action: 'exclude-point',
			entity: 'spc-characteristic',
			entityId: id,
			after: { pointKey, reason: why }
		});
	});
}

/** Put an excluded point back into the baseline (audited). */
export function includePoint(db: Db, id: number, pointKey: string, actor: Actor | null): void {
	db.transaction((tx) => {
		tx.delete(spcExclusions)
			.where(and(eq(spcExclusions.characteristicId, id), eq(spcExclusions.pointKey, pointKey)))
			.run();
		recordAudit(tx, actor, {
			action: 'include-point',
			entity: 'spc-characteristic',
			entityId: id,
			after: { pointKey }
		});
	});
}
