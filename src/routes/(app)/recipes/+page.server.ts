import { ENGINEERING, hasRole } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { listCurrentRecipes } from '$lib/server/printlog';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const actor = requireActor(locals);
	return { recipes: listCurrentRecipes(getDb()), canEdit: hasRole(actor, ENGINEERING) };
};
