import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { chartJson, chartQuery } from '$lib/spc/api-json';
import { chartDetail, NotFoundError } from '$lib/server/spc/chart-service';

/** One chart: points, limits, violations and capability (`?limit=` newest subgroups, ≤ 5000). */
export const GET = apiRoute(({ params, url }) => {
	const id = Number(params.id);
	try {
		return json(chartJson(chartDetail(getDb(), id, chartQuery(url))));
	} catch (err) {
		if (err instanceof NotFoundError) throw new ApiError(404, { error: err.message });
		throw err;
	}
});
