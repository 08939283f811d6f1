import { redirect } from '@sveltejs/kit';
import { signOut } from '$lib/server/auth';
import { getDb } from '$lib/server/db';
import { endSession } from '$lib/server/sessions';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => redirect(303, '/');

export const actions = {
	// The server-side session ends first, so a copied cookie stops working even if the Auth.js
	// sign-out below were skipped.
	default: async (event) => {
		const session = await event.locals.auth();
		endSession(getDb(), session?.sessionId);
		return signOut(event);
	}
} satisfies Actions;
