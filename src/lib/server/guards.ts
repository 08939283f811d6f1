import { error } from '@sveltejs/kit';
import { hasRole, ROLE_LABELS, type Actor, type Role } from '$lib/access';

/**
 * The per-load/per-action check that backs up hooks.server.ts: the signed-in actor, or a 401/403.
 * Actions do not run layout loads, so every action calls this itself.
 */
export function requireActor(locals: App.Locals, roles?: readonly Role[]): Actor {
	const actor = locals.actor;
	if (!actor) error(401, 'Please sign in.');
	if (roles && !hasRole(actor, roles)) {
		error(403, `${ROLE_LABELS[actor.role]}s cannot do this.`);
	}
	return actor;
}
