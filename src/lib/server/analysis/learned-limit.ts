import type { Actor } from '$lib/access';
import {
	DEFAULT_THRESHOLDS,
	STENCIL_TECHNOLOGIES,
	type PrintThresholds,
	type StencilTechnology
} from '$lib/stencil';
import { ApiError } from '../api';
import { recordAudit } from '../audit';
import type { Db } from '../db';
import { saveSiteThresholds, siteThresholds, THRESHOLDS_SETTING_KEY } from '../stencils/thresholds';
import { transferEfficiencyOffThread } from './te-thread';
import type { TeFilters } from './transfer-efficiency';

/** The TE floor the thresholds page learns limits at unless told otherwise. */
export const DEFAULT_TE_FLOOR = 0.7;

/** One technology's learned limit beside the limit in force and the common-practice value. */
export interface LearnedLimit {
	technology: StencilTechnology;
	/** The site's minimum area ratio in force now. */
	currentMinAreaRatio: number;
	/** The common-practice minimum (IPC-7525: 0.66). */
	commonMinAreaRatio: number;
	/** The area ratio where the fitted TE falls to the floor; null with `reason` when unsupported. */
	learnedMinAreaRatio: number | null;
	/** What adopting would set: the learned limit rounded up to 0.01 (the safer side). */
	proposedMinAreaRatio: number | null;
	reason: string | null;
	/** Pads in the fit (after trimming). */
	n: number;
	floor: number;
}

/** Round a learned limit up to 0.01: a limit only ever errs towards refusing an aperture. */
export function proposedLimit(learned: number): number {
	return Math.ceil(learned * 100 - 1e-9) / 100;
}

const teFilters = (technology: StencilTechnology, floor: number): TeFilters => ({
	technology,
	paste: null,
	powder: null,
	fromMs: null,
	toMs: null,
	floor
});

function learnedOf(
	technology: StencilTechnology,
	current: PrintThresholds,
	floor: number,
	te: { learnedMinAreaRatio: number | null; reason: string | null; n: number }
): LearnedLimit {
	return {
		technology,
		currentMinAreaRatio: current.minAreaRatio,
		commonMinAreaRatio: DEFAULT_THRESHOLDS[technology].minAreaRatio,
		learnedMinAreaRatio: te.learnedMinAreaRatio,
		proposedMinAreaRatio:
			te.learnedMinAreaRatio === null ? null : proposedLimit(te.learnedMinAreaRatio),
		reason: te.reason,
		n: te.n,
		floor
	};
}

/**
 * Each technology's learned minimum area ratio from the site's own prints (all pastes and
 * dates; one transfer-efficiency scan per technology on the analysis thread).
 */
export async function learnedLimits(db: Db, floor = DEFAULT_TE_FLOOR): Promise<LearnedLimit[]> {
	const out: LearnedLimit[] = [];
	for (const t of STENCIL_TECHNOLOGIES) out.push(await learnedLimit(db, t, floor));
	return out;
}

/** One technology's learned limit (all pastes and dates), beside the limit in force. */
export async function learnedLimit(
	db: Db,
	technology: StencilTechnology,
	floor = DEFAULT_TE_FLOOR
): Promise<LearnedLimit> {
	const te = await transferEfficiencyOffThread(db, teFilters(technology, floor));
	return learnedOf(technology, siteThresholds(db)[technology], floor, te);
}

export interface AdoptedLimit extends LearnedLimit {
	before: number;
	after: number;
	thresholds: Record<StencilTechnology, PrintThresholds>;
}

/**
 * Adopt the learned limit of one technology as the site's minimum area ratio (an engineer's
 * decision; the caller checks the role). The limit is computed again here, never taken from the
 * caller, rounded up to 0.01, and saved with two audit entries in one transaction: the settings
 * change (before/after) and what was adopted with its evidence (learned value, n, floor).
 * @throws ApiError 422 when the site's data support no limit for the technology; 409 when
 *   `expectedMinAreaRatio` (what the engineer approved) is no longer what the data give.
 */
export async function adoptLearnedLimit(
	db: Db,
	filters: TeFilters & { technology: StencilTechnology },
	actor: Actor | null,
	options: { expectedMinAreaRatio?: number } = {}
): Promise<AdoptedLimit> {
	const te = await transferEfficiencyOffThread(db, filters);
	const technology = filters.technology;
	if (te.learnedMinAreaRatio === null)
		throw new ApiError(422, {
			error: `No learned limit to adopt for ${technology}: ${te.reason ?? 'not enough data'}. Nothing was changed.`
		});
	const after = proposedLimit(te.learnedMinAreaRatio);
	// The engineer approved a value; new prints since may have moved it: ask again, save nothing.
	const expected = options.expectedMinAreaRatio;
	if (expected !== undefined && Math.abs(expected - after) > 1e-9)
		throw new ApiError(409, {
			error: `The learned limit for ${technology} is now ${after.toFixed(2)}, not the ${expected.toFixed(2)} that was approved (new prints since). Nothing was changed; look at it again.`
		});
	// Synchronous from here: nothing runs between reading the limit in force and saving.
	return db.transaction((tx) => {
		const current = siteThresholds(tx);
		const before = current[technology].minAreaRatio;
		// The evidence first, then the settings change: the newest entry of the settings stays the
		// full before/after of the thresholds, as after any other change of them.
		recordAudit(tx, actor, {
			action: 'adopt-learned-limit',
			entity: 'setting',
			entityId: THRESHOLDS_SETTING_KEY,
			before: { technology, minAreaRatio: before },
			after: {
				technology,
				minAreaRatio: after,
				learnedMinAreaRatio: te.learnedMinAreaRatio,
				n: te.n,
				floor: filters.floor,
				paste: filters.paste,
				powder: filters.powder,
				fromMs: filters.fromMs,
				toMs: filters.toMs
			}
		});
		const thresholds = saveSiteThresholds(
			tx as unknown as Db,
			{ ...current, [technology]: { ...current[technology], minAreaRatio: after } },
			actor
		);
		return {
			...learnedOf(technology, current[technology], filters.floor, te),
			before,
			after,
			thresholds
		};
	});
}
