import { error } from '@sveltejs/kit';
import { INSPECTION_IMPORTERS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { findProfile } from '$lib/server/ingest';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	requireActor(locals, INSPECTION_IMPORTERS);
	if (params.id === 'new') return { id: null, profile: null };
	const id = Number(params.id);
	const record = Number.isSafeInteger(id) && id > 0 ? findProfile(getDb(), id) : undefined;
	if (!record) error(404, `No mapping profile ${params.id}.`);
	return { id: record.id, profile: record.profile };
};
