import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { getBoard } from '$lib/server/ingest';

export const GET = apiRoute(({ params }) => {
	const id = Number(params.id);
	const found = getBoard(getDb(), id);
	if (!found) throw new ApiError(404, { error: `No board inspection ${id}.` });
	return json({ ...found.board, pads: found.pads });
});
