import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { discardQuarantined } from '$lib/server/cfx';

/** Discard a held message (audited; its body is dropped). */
export const POST = apiRoute(async ({ params }, actor) => {
	const id = Number(params.id);
	discardQuarantined(getDb(), id, actor);
	return json({ id, status: 'discarded' });
});
