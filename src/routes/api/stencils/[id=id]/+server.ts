import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import {
	checkStoredStencil,
	listImports,
	stencilAdvice,
	withStencilErrors
} from '$lib/server/stencils';

/**
 * The stencil with its thresholds, summary, thickness sweep, powder advice, overlapping openings
 * (paste area summed and as a union) and import history.
 */
export const GET = apiRoute(async ({ params }) => {
	const id = Number(params.id);
	return withStencilErrors(() => {
		const db = getDb();
		const check = checkStoredStencil(db, id);
		const advice = stencilAdvice(check);
		return json({
			...check.stencil,
			thresholds: check.thresholds,
			summary: check.summary,
			thicknessSweep: advice.sweep,
			powder: advice.powder,
			overlaps: advice.overlaps,
			imports: listImports(db, id)
		});
	});
});
