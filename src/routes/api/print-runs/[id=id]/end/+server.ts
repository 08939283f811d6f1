import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonText } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { endRun } from '$lib/server/printlog';
import { endRunSchema } from '$lib/schemas/printlog-forms';

/** End an open run; the body is optional: { endedAt?, boardsPrinted? }. */
export const POST = apiRoute(async ({ params, request }, actor) => {
	const id = Number(params.id);
	const text = await request.text();
	let body: unknown = {};
	if (text.trim() !== '') body = parseJsonText(text);
	const run = endRun(getDb(), id, endRunSchema.parse(body), actor);
	return json(run);
});
