import { requireActor } from '$lib/server/guards';
import type { PageServerLoad } from './$types';

/** The overview loads its tiles in the browser (GET /api/lines/overview, then the stream). */
export const load: PageServerLoad = ({ locals }) => {
	requireActor(locals);
	return {};
};
