import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { failureMap, readFailureMapFilters } from '$lib/server/analysis';

/** Where SPI failures gather across a product's boards, and the Pareto by pad class. */
export const GET = apiRoute(async ({ url }) =>
	json(await failureMap(getDb(), readFailureMapFilters(url)))
);
