import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { readTraceQuery, traceBoard } from '$lib/server/analysis';

/** A board by serial (exact, else prefix): its run, stencil, paste lot, recipe, operator, pads, signals. */
export const GET = apiRoute(({ url }) => json(traceBoard(getDb(), readTraceQuery(url).serial)));
