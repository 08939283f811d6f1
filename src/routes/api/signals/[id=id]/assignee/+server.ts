import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { assignSignal } from '$lib/server/floor/signal-owners';

const bodySchema = z.strictObject({
	userId: z.union([z.number().int().positive().max(Number.MAX_SAFE_INTEGER), z.null()])
});

/** Give an open signal an owner (`{"userId": 3}`) or none (`{"userId": null}`): 200, 404, 409, 422. */
export const PUT = apiRoute(async ({ params, request }, actor) => {
	const body = await parseJsonBody(request, bodySchema);
	const owner = assignSignal(getDb(), Number(params.id), body.userId, actor);
	return json({ id: owner.id, assignee: owner.assignee, assignedAt: owner.assignedAt });
});
