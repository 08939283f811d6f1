import { error } from '@sveltejs/kit';
import { INSPECTION_IMPORTERS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { findProfile } from '$lib/server/ingest';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	requireActor(locals, INSPECTION_IMPORTERS);
	const record = findProfile(getDb(), Number(params.id));
	if (!record) error(404, `No mapping profile ${params.id}.`);
	return { id: record.id, profile: record.profile };
};
