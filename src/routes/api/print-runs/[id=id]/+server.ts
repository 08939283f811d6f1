import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { getRun } from '$lib/server/printlog';

export const GET = apiRoute(({ params }) => {
	const run = getRun(getDb(), Number(params.id));
	if (!run) throw new ApiError(404, { error: 'No such print run.' });
	return json(run);
});
