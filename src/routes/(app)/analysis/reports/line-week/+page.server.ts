import { error } from '@sveltejs/kit';
import { ApiError } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { lineWeekReport } from '$lib/server/analysis';
import type { PageServerLoad } from './$types';

/** `?line=SMT-2&week=2026-W09` (ISO week, UTC). */
export const load: PageServerLoad = async ({ locals, url }) => {
	requireActor(locals);
	const line = (url.searchParams.get('line') ?? '').trim().slice(0, 100);
	const week = (url.searchParams.get('week') ?? '').trim().slice(0, 10);
	try {
		return { report: lineWeekReport(getDb(), line, week) };
	} catch (err) {
		if (err instanceof ApiError)
			error(
				err.status,
				err.fieldProblems.length > 0 ? 'week must be an ISO week such as 2026-W09' : err.message
			);
		throw err;
	}
};
