import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { ADMIN_ONLY, isRole } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { countActiveAdmins, createUser, DuplicateEmailError, listUsers, updateUser } from '$lib/server/users';
import { newUserSchema } from '$lib/schemas/users';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals, ADMIN_ONLY);
	return { users: listUsers(getDb()), form: await superValidate(zod4(newUserSchema)) };
};

function userIdFrom(data: FormData): number | null {
	const id = Number(data.get('userId'));
	return Number.isSafeInteger(id) && id > 0 ? id : null;
}

export const actions = {
	createUser: async ({ locals, request }) => {
		const actor = requireActor(locals, ADMIN_ONLY);
		const form = await superValidate(request, zod4(newUserSchema));
		if (!form.valid) return fail(400, { form });
		try {
			const user = await createUser(getDb(), form.data, actor);
			form.data.password = '';
			return message(form, `Added ${user.name} as ${user.role}.`);
		} catch (err) {
			if (err instanceof DuplicateEmailError) {
				form.errors.email = [err.message];
				return fail(409, { form });
			}
			throw err;
		}
	},
	changeRole: async ({ locals, request }) => {
		const actor = requireActor(locals, ADMIN_ONLY);
		const data = await request.formData();
		const id = userIdFrom(data);
		const role = data.get('role');
		if (!id || !isRole(role)) return fail(400, { rowError: 'Choose a known role.' });
		const db = getDb();
		if (actor.kind === 'user' && actor.id === id && role !== 'admin' && countActiveAdmins(db) <= 1) {
			return fail(400, { rowError: 'You are the last active administrator; keep at least one.' });
		}
		if (!updateUser(db, id, { role }, actor)) return fail(404, { rowError: 'No such user.' });
		return { rowMessage: 'Role changed.' };
	},
	setActive: async ({ locals, request }) => {
		const actor = requireActor(locals, ADMIN_ONLY);
		const data = await request.formData();
		const id = userIdFrom(data);
		const active = data.get('active') === 'true';
		if (!id) return fail(400, { rowError: 'No such user.' });
		if (actor.kind === 'user' && actor.id === id && !active) {
			return fail(400, { rowError: 'You cannot deactivate yourself.' });
		}
		if (!updateUser(getDb(), id, { active }, actor)) return fail(404, { rowError: 'No such user.' });
		return { rowMessage: active ? 'User reactivated.' : 'User deactivated; they can no longer sign in.' };
	}
} satisfies Actions;
