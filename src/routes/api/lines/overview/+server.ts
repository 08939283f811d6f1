import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { lineOverview } from '$lib/server/floor/overview';

/** Every active line's tile: `{ lines: [...], at }` (no caching: the floor changes by the second). */
export const GET = apiRoute(() =>
	json(lineOverview(getDb()), { headers: { 'cache-control': 'no-store' } })
);
