import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { createLine, listLines } from '$lib/server/factory';
import { lineInputSchema } from '$lib/schemas/factory';

export const GET = apiRoute(() => json({ lines: listLines(getDb()) }));

/** 201 with the line; a code already taken is a DuplicateCodeError, answered 409 by apiRoute. */
export const POST = apiRoute(async ({ request }, actor) => {
	const input = await parseJsonBody(request, lineInputSchema);
	return json(createLine(getDb(), input, actor), { status: 201 });
});
