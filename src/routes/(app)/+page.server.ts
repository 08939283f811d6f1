import { cfxStatus } from '$lib/server/cfx/receiver';
import { requireActor } from '$lib/server/guards';
import type { PageServerLoad } from './$types';

/**
 * The overview loads its tiles in the browser (GET /api/lines/overview, then the stream); the
 * state of the machines' message link (IPC-CFX) comes with the page and is refreshed by the page.
 */
export const load: PageServerLoad = ({ locals }) => {
	requireActor(locals);
	const { configured, connected, since } = cfxStatus();
	return { machineLink: { configured, connected, since } };
};
