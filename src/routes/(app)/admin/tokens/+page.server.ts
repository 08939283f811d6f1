import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { ADMIN_ONLY } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { askConfirmation } from '$lib/server/confirm';
import { createApiToken, listApiTokens, revokeApiToken } from '$lib/server/tokens';
import { newTokenSchema } from '$lib/schemas/users';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals, ADMIN_ONLY);
	return { tokens: listApiTokens(getDb()), form: await superValidate(zod4(newTokenSchema)) };
};

export const actions = {
	createToken: async ({ locals, request }) => {
		const actor = requireActor(locals, ADMIN_ONLY);
		const form = await superValidate(request, zod4(newTokenSchema));
		if (!form.valid) return fail(400, { form });
		const created = createApiToken(getDb(), form.data, actor);
		// The plain token is shown exactly once, in this response.
		return message(form, {
			name: created.name,
			token: created.token,
			expiresAt: created.expiresAt.toISOString()
		});
	},
	revokeToken: async ({ locals, request }) => {
		const actor = requireActor(locals, ADMIN_ONLY);
		const data = await request.formData();
		const id = Number(data.get('tokenId'));
		const db = getDb();
		const token = Number.isSafeInteger(id) ? listApiTokens(db).find((t) => t.id === id) : undefined;
		if (!token || token.revokedAt) {
			return fail(404, { revokeError: 'That token does not exist or is already revoked.' });
		}
		const ask = askConfirmation(data, '?/revokeToken', {
			title: `Revoke token “${token.name}”?`,
			message: `Token “${token.name}” (${token.prefix}…, ${token.role}) stops working at once: whatever uses it gets 401 from then on. This cannot be undone.`,
			confirmLabel: `Revoke “${token.name}”`
		});
		if (ask) return ask;
		if (!revokeApiToken(db, id, actor)) {
			return fail(404, { revokeError: 'That token does not exist or is already revoked.' });
		}
		return { revoked: true };
	}
} satisfies Actions;
