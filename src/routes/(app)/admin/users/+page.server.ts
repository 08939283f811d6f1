import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { ADMIN_ONLY, isRole, ROLE_LABELS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { askConfirmation } from '$lib/server/confirm';
import { endUserSessions, sessionCounts } from '$lib/server/sessions';
import { recordAudit } from '$lib/server/audit';
import {
	createUser,
	DuplicateEmailError,
	findUser,
	LastAdminError,
	listUsers,
	updateUser
} from '$lib/server/users';
import { newUserSchema } from '$lib/schemas/users';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals, ADMIN_ONLY);
	const db = getDb();
	const counts = sessionCounts(db);
	return {
		users: listUsers(db).map((u) => ({ ...u, sessions: counts.get(u.id) ?? 0 })),
		form: await superValidate(zod4(newUserSchema))
	};
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
		try {
			const user = updateUser(getDb(), id, { role }, actor);
			if (!user) return fail(404, { rowError: 'No such user.' });
			return { rowMessage: `${user.name} is now ${ROLE_LABELS[user.role]}; they sign in again.` };
		} catch (err) {
			if (err instanceof LastAdminError) return fail(409, { rowError: err.message });
			throw err;
		}
	},
	setActive: async ({ locals, request }) => {
		const actor = requireActor(locals, ADMIN_ONLY);
		const data = await request.formData();
		const id = userIdFrom(data);
		const active = data.get('active') === 'true';
		const db = getDb();
		const user = id ? findUser(db, id) : undefined;
		if (!id || !user) return fail(404, { rowError: 'No such user.' });
		if (!active) {
			const ask = askConfirmation(data, '?/setActive', {
				title: `Deactivate ${user.name}?`,
				message: `${user.name} (${user.email}) is signed out at once and can no longer sign in. Their history stays; you can reactivate them later.`,
				confirmLabel: `Deactivate ${user.name}`
			});
			if (ask) return ask;
		}
		try {
			updateUser(db, id, { active }, actor);
		} catch (err) {
			if (err instanceof LastAdminError) return fail(409, { rowError: err.message });
			throw err;
		}
		return {
			rowMessage: active
				? `${user.name} reactivated.`
				: `${user.name} deactivated; they are signed out and can no longer sign in.`
		};
	},
	signOutEverywhere: async ({ locals, request }) => {
		const actor = requireActor(locals, ADMIN_ONLY);
		const data = await request.formData();
		const id = userIdFrom(data);
		const db = getDb();
		const user = id ? findUser(db, id) : undefined;
		if (!id || !user) return fail(404, { rowError: 'No such user.' });
		const ended = db.transaction((tx) => {
			const n = endUserSessions(tx, id);
			recordAudit(tx, actor, {
				action: 'sign-out-everywhere',
				entity: 'user',
				entityId: id,
				after: { sessionsEnded: n }
			});
			return n;
		});
		return {
			rowMessage: `${user.name} signed out everywhere (${ended} session${ended === 1 ? '' : 's'} ended).`
		};
	}
} satisfies Actions;
