import { fail } from '@sveltejs/kit';
import { ENGINEERING, hasRole } from '$lib/access';
import { STENCIL_TECHNOLOGIES, type StencilTechnology } from '$lib/stencil';
import { ApiError } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import {
	ANALYSIS_OUTCOMES,
	ANALYSIS_PARAMETERS,
	adoptLearnedLimit,
	readTeFilters
} from '$lib/server/analysis';
import { siteThresholds } from '$lib/server/stencils';
import type { Actions, PageServerLoad } from './$types';

/** Filter choices only; the figures come from the API on the client as the filters change. */
export const load: PageServerLoad = async ({ locals }) => {
	const actor = requireActor(locals);
	const db = getDb();
	const c = db.$client;
	const pluck = (sql: string) => c.prepare(sql).pluck().all() as (string | number)[];
	return {
		technologies: STENCIL_TECHNOLOGIES,
		pastes: pluck(`select distinct alloy from paste_lots order by alloy`) as string[],
		powders: pluck(`select distinct powder_type from paste_lots order by powder_type`) as number[],
		products: pluck(`select code from products order by code`) as string[],
		lines: pluck(`select code from lines order by code`) as string[],
		parameters: Object.entries(ANALYSIS_PARAMETERS).map(([value, label]) => ({ value, label })),
		outcomes: Object.entries(ANALYSIS_OUTCOMES).map(([value, label]) => ({ value, label })),
		// The page opens on the technology with the most print runs (a few rows, not the pads).
		defaultTechnology:
			(c
				.prepare(
					`select s.technology from print_runs r join stencils s on s.id = r.stencil_id
					 group by s.technology order by count(*) desc limit 1`
				)
				.pluck()
				.get() as string | undefined) ?? '',
		stencils: c
			.prepare(`select id, name, revision, technology from stencils order by name, revision`)
			.all() as { id: number; name: string; revision: string; technology: string }[],
		siteMinAreaRatio: Object.fromEntries(
			Object.entries(siteThresholds(db)).map(([t, v]) => [t, v.minAreaRatio])
		) as Record<StencilTechnology, number>,
		canAdopt: hasRole(actor, ENGINEERING),
		thisWeek: c.prepare(`select strftime('%G-W%V', 'now')`).pluck().get() as string
	};
};

export const actions: Actions = {
	/**
	 * Adopt the learned limit as the site's minimum area ratio for one technology (engineers;
	 * audited). `adoptLearnedLimit` computes the limit again from the posted filters, never takes
	 * it from the form, and rounds it up to 0.01 (the safer side).
	 */
	adopt: async ({ request, locals }) => {
		const actor = requireActor(locals, ENGINEERING);
		const form = await request.formData();
		const params = new URLSearchParams();
		for (const key of ['technology', 'paste', 'powder', 'from', 'to', 'floor']) {
			const v = form.get(key);
			if (typeof v === 'string' && v.trim() !== '') params.set(key, v.slice(0, 200));
		}
		let filters;
		try {
			filters = readTeFilters(new URL(`http://local/?${params}`));
		} catch (err) {
			if (err instanceof ApiError)
				return fail(400, {
					adoptError: err.fieldProblems.map((f) => `${f.field} ${f.message}`).join('; ')
				});
			throw err;
		}
		if (filters.technology === null)
			return fail(400, { adoptError: 'choose one stencil technology to adopt a limit for' });
		try {
			const adopted = await adoptLearnedLimit(
				getDb(),
				{ ...filters, technology: filters.technology as StencilTechnology },
				actor
			);
			return {
				adopted: {
					technology: adopted.technology,
					minAreaRatio: adopted.after,
					learned: adopted.learnedMinAreaRatio
				}
			};
		} catch (err) {
			if (err instanceof ApiError && err.status === 422)
				return fail(422, { adoptError: err.message });
			throw err;
		}
	}
};
