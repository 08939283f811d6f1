import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { getCapabilityThresholds } from '$lib/server/spc/capability-settings';
import { analyzeStudy, parseAnalyzeBody } from '$lib/spc';

/** Ad-hoc study: 200 with limits, capability and violations; 422 with field errors. */
export const POST = apiRoute(async ({ request }) => {
	const body = parseAnalyzeBody(await request.text());
	if (!body.ok) throw new ApiError(400, { error: body.error });
	const outcome = analyzeStudy(body.value, getCapabilityThresholds(getDb()));
	if (!outcome.ok) {
		return json({ errors: outcome.errors }, { status: outcome.tooLarge ? 413 : 422 });
	}
	return json(outcome.result);
});
