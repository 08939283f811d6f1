import { INSPECTION_IMPORTERS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { listProfiles } from '$lib/server/ingest';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals, INSPECTION_IMPORTERS);
	return { profiles: listProfiles(getDb()) };
};
