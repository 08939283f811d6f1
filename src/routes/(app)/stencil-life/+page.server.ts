import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { listStencilLife } from '$lib/server/printlog';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals);
	return { stencils: listStencilLife(getDb()) };
};
