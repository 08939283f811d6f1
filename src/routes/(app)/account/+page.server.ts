import { fail, redirect } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { recordAudit } from '$lib/server/audit';
import { countUserSessions, endUserSessions } from '$lib/server/sessions';
import { changePassword, WrongPasswordError } from '$lib/server/users';
import { changePasswordSchema } from '$lib/schemas/users';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	const actor = requireActor(locals);
	if (actor.kind !== 'user') redirect(303, '/');
	return { sessions: countUserSessions(getDb(), actor.id) };
};

export const actions = {
	/** A new password ends every session, this one too: the person signs in again with it. */
	changePassword: async ({ locals, request }) => {
		const actor = requireActor(locals);
		if (actor.kind !== 'user') return fail(403, { passwordError: 'Only people have passwords.' });
		const data = await request.formData();
		const parsed = changePasswordSchema.safeParse({
			currentPassword: String(data.get('currentPassword') ?? ''),
			newPassword: String(data.get('newPassword') ?? ''),
			confirmPassword: String(data.get('confirmPassword') ?? '')
		});
		if (!parsed.success) {
			const fields = Object.fromEntries(
				parsed.error.issues.map((i) => [String(i.path[0]), i.message])
			);
			return fail(400, { passwordFields: fields as Record<string, string> });
		}
		try {
			await changePassword(
				getDb(),
				actor.id,
				parsed.data.currentPassword,
				parsed.data.newPassword,
				actor
			);
		} catch (err) {
			if (err instanceof WrongPasswordError) {
				return fail(400, {
					passwordFields: { currentPassword: err.message } as Record<string, string>
				});
			}
			throw err;
		}
		redirect(303, '/signin?changed=password');
	},
	signOutEverywhere: ({ locals }) => {
		const actor = requireActor(locals);
		if (actor.kind !== 'user') return fail(403, { passwordError: 'Only people sign in.' });
		getDb().transaction((tx) => {
			const n = endUserSessions(tx, actor.id);
			recordAudit(tx, actor, {
				action: 'sign-out-everywhere',
				entity: 'user',
				entityId: actor.id,
				after: { sessionsEnded: n }
			});
		});
		redirect(303, '/signin?changed=sessions');
	}
} satisfies Actions;
