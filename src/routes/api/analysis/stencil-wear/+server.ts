import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { readStencilQuery, stencilWear } from '$lib/server/analysis';

/** TE and volume of a stencil's runs against its print count, with the wear flag. */
export const GET = apiRoute(({ url }) => {
	const q = readStencilQuery(url, true);
	return json(stencilWear(getDb(), q.stencilId, q.drop));
});
