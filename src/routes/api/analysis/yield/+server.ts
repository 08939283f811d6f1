import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { firstPassYield, readYieldFilters } from '$lib/server/analysis';

/** First-pass SPI yield by line, product or ISO week. */
export const GET = apiRoute(({ url }) => json(firstPassYield(getDb(), readYieldFilters(url))));
