import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { getImport } from '$lib/server/ingest';

export const GET = apiRoute(({ params }) => {
	const id = Number(params.id);
	const record = getImport(getDb(), id);
	if (!record) throw new ApiError(404, { error: `No SPI import ${id}.` });
	return json(record);
});
