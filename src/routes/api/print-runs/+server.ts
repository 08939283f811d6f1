import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { listRuns, queryObject, startRun } from '$lib/server/printlog';
import { printRunSchema } from '$lib/schemas/printlog';
import { runFiltersSchema, toRunFilters } from '$lib/schemas/printlog-forms';

/** Runs, newest first, filtered by line, product, stencil, lot and start date. */
export const GET = apiRoute(({ url }) => {
	const filters = runFiltersSchema.parse(queryObject(url));
	const runs = listRuns(getDb(), toRunFilters(filters));
	return json({ runs });
});

/** Log (start) a run: 201 { id, deviations, warnings }; 422 naming what is refused. */
export const POST = apiRoute(async ({ request }, actor) => {
	const input = await parseJsonBody(request, printRunSchema);
	const started = startRun(getDb(), input, actor);
	return json(started, { status: 201 });
});
