import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { readTeFilters, transferEfficiency } from '$lib/server/analysis';

/** Transfer efficiency against area ratio from the site's SPI data, with the learned AR limit. */
export const GET = apiRoute(async ({ url }) =>
	json(await transferEfficiency(getDb(), readTeFilters(url)))
);
