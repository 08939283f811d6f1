import { STENCIL_TECHNOLOGIES } from '$lib/stencil';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { ANALYSIS_OUTCOMES, ANALYSIS_PARAMETERS } from '$lib/server/analysis';
import type { PageServerLoad } from './$types';

/** Filter choices only; the figures come from the API on the client as the filters change. */
export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals);
	const c = getDb().$client;
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
			.all() as { id: number; name: string; revision: string; technology: string }[]
	};
};
