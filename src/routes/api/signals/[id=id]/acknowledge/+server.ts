import { json } from '@sveltejs/kit';
import { ApiError, apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { acknowledgeBodySchema, signalJson } from '$lib/spc/api-json';
import { acknowledgeSignal, AcknowledgeError } from '$lib/server/spc/signals';

/** Acknowledge with a listed cause and action (+ note): 200, 404, 409 or 422. */
export const POST = apiRoute(async ({ params, request }, actor) => {
	const id = Number(params.id);
	const body = await parseJsonBody(request, acknowledgeBodySchema);
	try {
		return json({ signals: acknowledgeSignal(getDb(), id, body, actor).map(signalJson) });
	} catch (err) {
		if (!(err instanceof AcknowledgeError)) throw err;
		if (err.status === 422) {
			throw new ApiError(422, { errors: [{ field: err.field ?? 'body', message: err.message }] });
		}
		throw new ApiError(err.status, { error: err.message });
	}
});
