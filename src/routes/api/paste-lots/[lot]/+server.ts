import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { getPasteLot } from '$lib/server/printlog';

/** One lot by lot number (or numeric id) with its events, state and run assessment. */
export const GET = apiRoute(({ params }) => {
	const lot = getPasteLot(getDb(), params.lot ?? '');
	if (!lot) throw new ApiError(404, { error: `No paste lot "${params.lot}".` });
	return json(lot);
});
