import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { acknowledgeBodySchema, signalJson } from '$lib/spc/api-json';
import { acknowledgeSignal } from '$lib/server/spc/signals';

/** Acknowledge with a listed cause and action (+ note): 200, 404, 409 or 422 (AcknowledgeError). */
export const POST = apiRoute(async ({ params, request }, actor) => {
	const body = await parseJsonBody(request, acknowledgeBodySchema);
	const signals = acknowledgeSignal(getDb(), Number(params.id), body, actor);
	return json({ signals: signals.map(signalJson) });
});
