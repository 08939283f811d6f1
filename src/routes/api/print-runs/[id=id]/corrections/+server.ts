import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { correctRun } from '$lib/server/printlog';
import { correctRunSchema } from '$lib/schemas/printlog-forms';

/** Correct a logged run; the reason and the before/after go to the audit log. */
export const POST = apiRoute(async ({ params, request }, actor) => {
	const id = Number(params.id);
	const input = await parseJsonBody(request, correctRunSchema);
	const run = correctRun(getDb(), id, input, actor);
	return json(run);
});
