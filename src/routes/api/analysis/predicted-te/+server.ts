import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { predictedTeForStencil, readStencilQuery } from '$lib/server/analysis';

/** Each aperture's predicted TE from the site's own model for the stencil's technology. */
export const GET = apiRoute(async ({ url }) => {
	const q = readStencilQuery(url, false);
	return json(await predictedTeForStencil(getDb(), q.stencilId, q.floor));
});
