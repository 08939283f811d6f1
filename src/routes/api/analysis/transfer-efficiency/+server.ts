import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { readTeFilters, transferEfficiencyOffThread } from '$lib/server/analysis';

/**
 * Transfer efficiency against area ratio from the site's SPI data, with the learned AR limit. The
 * pad scan runs on the analysis thread, so other requests are answered meanwhile.
 */
export const GET = apiRoute(async ({ url }) =>
	json(await transferEfficiencyOffThread(getDb(), readTeFilters(url)))
);
