import { hasRole, SPC_EDITORS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { chartSummary } from '$lib/server/spc/summary';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const actor = requireActor(locals);
	return { charts: chartSummary(getDb()), canEdit: hasRole(actor, SPC_EDITORS) };
};
