import { fail } from '@sveltejs/kit';
import { INSPECTION_IMPORTERS } from '$lib/access';
import { ApiError } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { deleteProfile, listProfiles } from '$lib/server/ingest';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals, INSPECTION_IMPORTERS);
	return { profiles: listProfiles(getDb()) };
};

export const actions = {
	/** Delete an unused profile (the list shows a confirmation first). */
	delete: async ({ locals, request }) => {
		const actor = requireActor(locals, INSPECTION_IMPORTERS);
		const form = await request.formData();
		const id = Number(form.get('id'));
		if (!Number.isSafeInteger(id) || id <= 0) {
			return fail(400, { deleteId: null, deleteError: 'Choose a profile to delete.' });
		}
		try {
			deleteProfile(getDb(), id, actor, process.env.SPI_WATCH_PROFILE ?? null);
		} catch (e) {
			if (!(e instanceof ApiError)) throw e;
			return fail(e.status, { deleteId: id, deleteError: e.message });
		}
		return { deleted: String(form.get('name') ?? id) };
	}
} satisfies Actions;
