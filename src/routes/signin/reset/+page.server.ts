import { fail } from '@sveltejs/kit';
import { appOrigin, clientAddress } from '$lib/server/auth';
import { getDb } from '$lib/server/db';
import {
	requestPasswordReset,
	resetLinkUsable,
	resetPassword,
	ResetLinkError
} from '$lib/server/password-reset';
import { resetPasswordSchema, resetRequestSchema } from '$lib/schemas/users';
import type { Actions, PageServerLoad } from './$types';

const TOKEN = /^[A-Za-z0-9_-]{43}$/;

/** The one answer to every reset request, whether or not the address is known or throttled. */
const SAME_ANSWER =
	'If that address belongs to an active account, a link to set a new password is on its way. It works once, within 30 minutes.';

export const load: PageServerLoad = ({ url }) => {
	const token = url.searchParams.get('token');
	if (token === null) return { mode: 'request' as const, token: null, usable: false };
	const usable = TOKEN.test(token) && resetLinkUsable(getDb(), token);
	return { mode: 'set' as const, token: usable ? token : null, usable };
};

export const actions = {
	request: async ({ request }) => {
		const data = await request.formData();
		const parsed = resetRequestSchema.safeParse({
			email: String(data.get('email') ?? '').slice(0, 300)
		});
		if (!parsed.success) {
			return fail(400, {
				requestError: parsed.error.issues[0].message,
				sent: null as string | null
			});
		}
		const origin = appOrigin();
		const ip = clientAddress();
		// After the answer: the page takes as long whether or not the address exists.
		setImmediate(() => {
			requestPasswordReset(getDb(), parsed.data.email, ip, origin).catch((err) =>
				console.error('[rollbead] password reset mail failed', err)
			);
		});
		return { sent: SAME_ANSWER, requestError: null as string | null };
	},
	set: async ({ request }) => {
		const data = await request.formData();
		const parsed = resetPasswordSchema.safeParse({
			token: String(data.get('token') ?? ''),
			newPassword: String(data.get('newPassword') ?? ''),
			confirmPassword: String(data.get('confirmPassword') ?? '')
		});
		if (!parsed.success) {
			const fields = Object.fromEntries(
				parsed.error.issues.map((i) => [String(i.path[0]), i.message])
			);
			return fail(400, { setFields: fields as Record<string, string>, done: false });
		}
		try {
			await resetPassword(getDb(), parsed.data.token, parsed.data.newPassword);
		} catch (err) {
			if (err instanceof ResetLinkError) {
				return fail(err.status, {
					setFields: { token: err.message } as Record<string, string>,
					done: false
				});
			}
			throw err;
		}
		return { done: true, setFields: {} as Record<string, string> };
	}
} satisfies Actions;
