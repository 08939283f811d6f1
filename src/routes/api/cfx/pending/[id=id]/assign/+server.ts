import { json } from '@sveltejs/kit';
import { cfxAssignSchema } from '$lib/cfx/endpoint-schema';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { assignPendingInspection } from '$lib/server/cfx';

/** Give a held inspection its product: the measurements go through the SPI ingest now. */
export const POST = apiRoute(async ({ params, request }, actor) => {
	const id = Number(params.id);
	const { product } = await parseJsonBody(request, cfxAssignSchema);
	return json(await assignPendingInspection(getDb(), id, product, actor));
});
