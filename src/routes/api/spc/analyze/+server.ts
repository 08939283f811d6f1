import { json } from '@sveltejs/kit';
import { apiRoute, readJson } from '$lib/server/api';
import { analyzeStudy } from '$lib/spc';

/** Ad-hoc study: 200 with limits, capability and violations; 422 with field errors. */
export const POST = apiRoute(async ({ request }) => {
	const outcome = analyzeStudy(await readJson(request));
	if (!outcome.ok) return json({ errors: outcome.errors }, { status: 422 });
	return json(outcome.result);
});
