import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = ({ locals }) => {
	const actor = locals.actor;
	return {
		/** Who is signed in, for the navigation; never the password hash or token. */
		viewer:
			actor?.kind === 'user' ? { name: actor.name, email: actor.email, role: actor.role } : null
	};
};
