import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { listQuarantine } from '$lib/server/cfx';

/** Messages held in quarantine with their reasons (`?all=1`: retried and discarded too). */
export const GET = apiRoute(({ url }) => {
	const limit = Number(url.searchParams.get('limit') ?? 200);
	return json({
		messages: listQuarantine(getDb(), {
			all: url.searchParams.get('all') === '1',
			limit: Number.isSafeInteger(limit) && limit > 0 ? limit : 200
		})
	});
});
