import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { retryQuarantined } from '$lib/server/cfx';

/** Map a held message again (after its handle was mapped): its outcome; held again with the new reason. */
export const POST = apiRoute(async ({ params }) => {
	const id = Number(params.id);
	return json(await retryQuarantined(getDb(), id));
});
