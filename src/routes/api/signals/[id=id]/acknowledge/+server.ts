import { json } from '@sveltejs/kit';
import { ApiError, apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { acknowledgeBodySchema, signalJson } from '$lib/spc/api-json';
import { tryAcknowledge } from '$lib/server/spc/acknowledge';

/** Acknowledge with a listed cause and action (+ note): 200, 404, 409 or 422. */
export const POST = apiRoute(async ({ params, request }, actor) => {
	const id = Number(params.id);
	const body = await parseJsonBody(request, acknowledgeBodySchema);
	const out = tryAcknowledge(getDb(), id, body, actor);
	if (out.ok) return json({ signals: out.signals.map(signalJson) });
	if (out.status === 422)
		throw new ApiError(422, { errors: [{ field: out.field ?? 'body', message: out.message }] });
	throw new ApiError(out.status, { error: out.message });
});
