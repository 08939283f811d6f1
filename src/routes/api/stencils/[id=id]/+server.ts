import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { cachedStencil, listImports } from '$lib/server/stencils';

/**
 * The stencil with its thresholds, summary, thickness sweep, powder advice, overlapping openings
 * (paste area summed and as a union) and import history.
 */
export const GET = apiRoute(({ params }) => {
	const id = Number(params.id);
	const db = getDb();
	// Kept per stencil revision, as the stencil page reads it (see `cachedStencil`).
	const cached = cachedStencil(db, id);
	const check = cached.check;
	const advice = cached.advice();
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
