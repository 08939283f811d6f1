import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { checkStoredStencil, findStencil } from '$lib/server/stencils';
import { aperturesCsv } from '$lib/csv/apertures-csv';
import { csvResponse } from '$lib/csv/write-csv';
import type { RequestHandler } from './$types';

/** The aperture table as CSV (unrounded numbers, lengths in µm); `?status=fail` for failures only. */
export const GET: RequestHandler = ({ locals, params, url }) => {
	requireActor(locals);
	const id = Number(params.id);
	const db = getDb();
	if (!findStencil(db, id)) error(404, 'No such stencil.');
	const check = checkStoredStencil(db, id);
	const only = url.searchParams.get('status');
	const list =
		only === 'fail' || only === 'pass'
			? check.apertures.filter((a) => a.status === only)
			: check.apertures;
	const s = check.stencil;
	const csv = aperturesCsv({ stencil: s, thresholds: check.thresholds, apertures: list });
	return csvResponse(csv, `${s.name}-rev-${s.revision}-apertures.csv`);
};
