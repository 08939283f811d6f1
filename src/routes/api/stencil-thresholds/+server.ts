import { json } from '@sveltejs/kit';
import { ApiError, apiRoute, readJson } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { saveSiteThresholds, siteThresholds, thresholdsUpdate } from '$lib/server/stencils';
import { DEFAULT_THRESHOLDS } from '$lib/stencil';

/** The site's minimum area and aspect ratio per technology, and the IPC-7525 defaults. */
export const GET = apiRoute(() =>
	json({ thresholds: siteThresholds(getDb()), defaults: DEFAULT_THRESHOLDS })
);

/** Change some or all limits (audited like the thresholds page); 422 names each bad field. */
export const PUT = apiRoute(async ({ request }, actor) => {
	const body = await readJson(request);
	const db = getDb();
	// better-sqlite3 is synchronous: nothing runs between reading the current values and saving.
	const update = thresholdsUpdate(siteThresholds(db), body);
	if ('errors' in update)
		throw new ApiError(422, {
			error: 'The thresholds were refused; nothing was saved.',
			errors: update.errors
		});
	const thresholds = saveSiteThresholds(db, update.thresholds, actor);
	return json({ thresholds, defaults: DEFAULT_THRESHOLDS });
});
