import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { chartJson, chartQuery } from '$lib/spc/api-json';
import { chartDetail } from '$lib/server/spc/chart-service';
import { cachedChartJson } from '$lib/server/spc/chart-json-cache';

/** One chart: points, limits, violations and capability (`?limit=` newest subgroups, ≤ 5000). */
export const GET = apiRoute(({ params, url }) => {
	const db = getDb();
	const id = Number(params.id);
	const query = chartQuery(url);
	// Kept until anyone commits a change (chart-json-cache.ts): a repeat is not computed again.
	const body = cachedChartJson(db, `${id}:${query.limit}`, () =>
		chartJson(chartDetail(db, id, query))
	);
	return new Response(body, { headers: { 'content-type': 'application/json' } });
});
