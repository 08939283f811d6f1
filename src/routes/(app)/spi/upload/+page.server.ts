import { INSPECTION_IMPORTERS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { maxUploadBytes } from '$lib/server/env-defaults';
import { requireActor } from '$lib/server/guards';
import { listProfiles } from '$lib/server/ingest';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals, INSPECTION_IMPORTERS);
	return {
		profiles: listProfiles(getDb()).map((p) => ({ id: p.id, name: p.name, machine: p.machine })),
		maxUploadBytes: maxUploadBytes()
	};
};
