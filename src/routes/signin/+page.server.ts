import { fail, isRedirect, redirect } from '@sveltejs/kit';
import { CredentialsSignin } from '@auth/sveltekit';
import { appOrigin, signIn } from '$lib/server/auth';
import { sameOriginPath } from '$lib/server/safe-redirect';
import { getDb } from '$lib/server/db';
import { signInLockMinutes } from '$lib/server/users';
import { signInSchema } from '$lib/schemas/users';
import type { Actions, PageServerLoad } from './$types';

/** Only paths on ORIGIN are followed after sign-in, never another host (see safe-redirect.ts). */
function safeRedirect(target: string | null): string {
	return sameOriginPath(target, appOrigin());
}

export const load: PageServerLoad = ({ locals, url }) => {
	if (locals.actor) redirect(303, safeRedirect(url.searchParams.get('redirectTo')));
	const changed = url.searchParams.get('changed');
	return {
		redirectTo: safeRedirect(url.searchParams.get('redirectTo')),
		notice:
			changed === 'password'
				? 'Your password is changed and every session of yours has ended. Sign in with the new password.'
				: changed === 'sessions'
					? 'You are signed out everywhere. Sign in again here.'
					: null
	};
};

export const actions = {
	default: async (event) => {
		// Auth.js reads the form itself, so validate a copy.
		const form = await event.request.clone().formData();
		const parsed = signInSchema.safeParse({
			email: form.get('email'),
			password: form.get('password')
		});
		const email = String(form.get('email') ?? '').slice(0, 254);
		if (!parsed.success) {
			const fields = Object.fromEntries(parsed.error.issues.map((i) => [i.path[0], i.message]));
			return fail(400, { email, fields, error: null as string | null });
		}
		const lockMinutes = signInLockMinutes(getDb(), parsed.data.email, event.getClientAddress());
		if (lockMinutes > 0) {
			return fail(429, {
				email,
				fields: {},
				error: `Too many failed attempts. Try again in ${lockMinutes} minute${lockMinutes === 1 ? '' : 's'}, or ask an administrator.`
			});
		}
		try {
			await signIn(event);
		} catch (err) {
			if (isRedirect(err)) throw err;
			if (err instanceof CredentialsSignin) {
				return fail(400, { email, fields: {}, error: 'Wrong e-mail or password.' });
			}
			throw err;
		}
		redirect(303, '/');
	}
} satisfies Actions;
