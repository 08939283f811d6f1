import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { checkStoredStencil, findStencil, stencilAdvice } from '$lib/server/stencils';
import type { PageServerLoad } from './$types';

/** Everything the printed report shows; failing apertures listed in full, passing ones counted. */
export const load: PageServerLoad = ({ locals, params }) => {
	requireActor(locals);
	const id = Number(params.id);
	const db = getDb();
	if (!findStencil(db, id)) error(404, 'No such stencil.');
	const check = checkStoredStencil(db, id);
	const advice = stencilAdvice(check);
	return {
		stencil: check.stencil,
		thresholds: check.thresholds,
		summary: check.summary,
		sweep: advice.sweep,
		powder: advice.powder,
		failing: check.apertures
			.filter((a) => a.status === 'fail')
			.sort((a, b) => a.areaRatio - b.areaRatio)
			.map((a) => ({
				id: a.id,
				refdes: a.refdes,
				pad: a.pad,
				shape: a.shape,
				minDimensionUm: a.minDimensionUm,
				thicknessUm: a.thicknessUm,
				areaRatio: a.areaRatio,
				aspectRatio: a.aspectRatio,
				maxPassingThicknessUm: a.maxPassingThicknessUm,
				reasons: a.reasons.map((r) => r.limit)
			})),
		printedAt: new Date()
	};
};
