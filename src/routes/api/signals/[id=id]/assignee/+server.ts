import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { ApiError, apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { assignSignal, AssignError } from '$lib/server/floor/signal-owners';

const bodySchema = z.strictObject({
	userId: z.union([z.number().int().positive().max(Number.MAX_SAFE_INTEGER), z.null()])
});

/** Give an open signal an owner (`{"userId": 3}`) or none (`{"userId": null}`): 200, 404, 409, 422. */
export const PUT = apiRoute(async ({ params, request }, actor) => {
	const id = Number(params.id);
	const body = await parseJsonBody(request, bodySchema);
	try {
		const owner = assignSignal(getDb(), id, body.userId, actor);
		return json({ id: owner.id, assignee: owner.assignee, assignedAt: owner.assignedAt });
	} catch (err) {
		if (!(err instanceof AssignError)) throw err;
		if (err.status === 422) {
			throw new ApiError(422, { errors: [{ field: err.field ?? 'userId', message: err.message }] });
		}
		throw new ApiError(err.status, { error: err.message });
	}
});
