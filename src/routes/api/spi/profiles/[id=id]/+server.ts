import { json } from '@sveltejs/kit';
import { ApiError, apiRoute, readJson } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { deleteProfile, findProfile, saveProfile } from '$lib/server/ingest';

export const GET = apiRoute(({ params }) => {
	const id = Number(params.id);
	const record = findProfile(getDb(), id);
	if (!record) throw new ApiError(404, { error: `No mapping profile ${id}.` });
	return json(record);
});

export const PUT = apiRoute(async ({ params, request }, actor) => {
	const id = Number(params.id);
	return json(saveProfile(getDb(), id, await readJson(request), actor));
});

/** 204 when deleted; 404 unknown; 409 when imports (or the watched folder) use the profile. */
export const DELETE = apiRoute(({ params }, actor) => {
	const id = Number(params.id);
	deleteProfile(getDb(), id, actor, process.env.SPI_WATCH_PROFILE ?? null);
	return new Response(null, { status: 204 });
});
