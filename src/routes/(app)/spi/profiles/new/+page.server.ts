import { INSPECTION_IMPORTERS } from '$lib/access';
import { requireActor } from '$lib/server/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals, INSPECTION_IMPORTERS);
};
