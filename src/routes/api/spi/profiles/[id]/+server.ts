import { json } from '@sveltejs/kit';
import { ApiError, apiRoute, idParam, readJson } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { findProfile, saveProfile } from '$lib/server/ingest';

export const GET = apiRoute(({ params }) => {
	const id = idParam(params.id, 'mapping profile');
	const record = findProfile(getDb(), id);
	if (!record) throw new ApiError(404, { error: `No mapping profile ${id}.` });
	return json(record);
});

export const PUT = apiRoute(async ({ params, request }, actor) => {
	const id = idParam(params.id, 'mapping profile');
	return json(saveProfile(getDb(), id, await readJson(request), actor));
});
