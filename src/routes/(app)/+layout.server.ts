import { error } from '@sveltejs/kit';
import { hasRole, pageRolesFor, ROLE_LABELS } from '$lib/access';
import type { LayoutServerLoad } from './$types';

// Every page in (app) passes through here, so a role refused by PAGE_POLICY sees a friendly page.
export const load: LayoutServerLoad = ({ locals, url }) => {
	const actor = locals.actor;
	if (!actor) error(401, 'Please sign in.');
	if (!hasRole(actor, pageRolesFor(url.pathname))) {
		error(403, `${ROLE_LABELS[actor.role]}s cannot open this page.`);
	}
	return {};
};
