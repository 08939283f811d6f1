import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { addPasteEvent } from '$lib/server/printlog';
import { pasteEventSchema } from '$lib/schemas/printlog';

/** Log a handling event: 201 { lot, warnings }; 422 when the event may not follow. */
export const POST = apiRoute(async ({ params, request }, actor) => {
	const input = await parseJsonBody(request, pasteEventSchema);
	return json(addPasteEvent(getDb(), params.lot ?? '', input, actor), { status: 201 });
});
