import { json } from '@sveltejs/kit';
import { ApiError, apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { createLine, DuplicateCodeError, listLines } from '$lib/server/factory';
import { lineInputSchema } from '$lib/schemas/factory';

export const GET = apiRoute(() => json({ lines: listLines(getDb()) }));

export const POST = apiRoute(async ({ request }, actor) => {
	const input = await parseJsonBody(request, lineInputSchema);
	try {
		return json(createLine(getDb(), input, actor), { status: 201 });
	} catch (err) {
		if (err instanceof DuplicateCodeError) throw new ApiError(409, { error: err.message });
		throw err;
	}
});
