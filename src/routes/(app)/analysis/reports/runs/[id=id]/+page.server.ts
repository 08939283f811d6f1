import { error } from '@sveltejs/kit';
import { ApiError } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { runReport } from '$lib/server/analysis';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	requireActor(locals);
	const id = Number(params.id);
	try {
		return { report: await runReport(getDb(), id) };
	} catch (err) {
		if (err instanceof ApiError && err.status === 404) error(404, err.message);
		throw err;
	}
};
