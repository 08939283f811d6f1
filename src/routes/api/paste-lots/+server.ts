import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { createPasteLot, listPasteLots } from '$lib/server/printlog';
import { pasteLotSchema } from '$lib/schemas/printlog';

export const GET = apiRoute(() => json({ lots: listPasteLots(getDb()) }));

/** Register a lot: 201 the lot with its handling settings and state; 409 when the number exists. */
export const POST = apiRoute(async ({ request }, actor) => {
	const input = await parseJsonBody(request, pasteLotSchema);
	return json(createPasteLot(getDb(), input, actor), { status: 201 });
});
