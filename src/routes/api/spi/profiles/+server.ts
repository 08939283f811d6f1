import { json } from '@sveltejs/kit';
import { apiRoute, readJson } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { listProfiles, saveProfile } from '$lib/server/ingest';

export const GET = apiRoute(() => json({ profiles: listProfiles(getDb()) }));

export const POST = apiRoute(async ({ request }, actor) => {
	const record = saveProfile(getDb(), null, await readJson(request), actor);
	return json(record, { status: 201 });
});
