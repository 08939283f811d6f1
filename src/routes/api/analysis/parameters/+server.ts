import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { parameterEffect, readParameterFilters } from '$lib/server/analysis';

/** One logged print parameter against one per-run SPI outcome: scatter, line, r with its CI. */
export const GET = apiRoute(({ url }) => json(parameterEffect(getDb(), readParameterFilters(url))));
