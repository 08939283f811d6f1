import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { queryObject, runTrends } from '$lib/server/printlog';

/** I-MR series of every logged numeric parameter for ?line=&product=, with the recipe window. */
export const GET = apiRoute(({ url }) => {
	const { line, product } = queryObject(url);
	if (!line || !product) {
		throw new ApiError(400, {
			error: 'The request has invalid fields.',
			fields: [
				...(line ? [] : [{ field: 'line', message: 'is required' }]),
				...(product ? [] : [{ field: 'product', message: 'is required' }])
			]
		});
	}
	return json(runTrends(getDb(), { line, product }));
});
