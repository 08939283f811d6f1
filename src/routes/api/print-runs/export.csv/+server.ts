import { getDb } from '$lib/server/db';
import { apiRoute } from '$lib/server/api';
import { listRuns, queryObject, runsToCsv } from '$lib/server/printlog';
import { NUMERIC_PARAMETER_KEYS, CATEGORICAL_PARAMETER_KEYS } from '$lib/printlog';
import { runFiltersSchema, toRunFilters } from '$lib/schemas/printlog-forms';

/** The run list as CSV, with the same filters as GET /api/print-runs (up to 5000 runs). */
export const GET = apiRoute(({ url }) => {
	const filters = runFiltersSchema.parse(queryObject(url));
	const runs = listRuns(getDb(), { limit: 5000, ...toRunFilters(filters) });
	const csv = runsToCsv(runs, [...NUMERIC_PARAMETER_KEYS, ...CATEGORICAL_PARAMETER_KEYS]);
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': 'attachment; filename="print-runs.csv"'
		}
	});
});
