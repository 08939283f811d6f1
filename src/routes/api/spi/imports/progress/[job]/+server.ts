import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { isJobKey, readProgress } from '$lib/server/ingest';

export const GET = apiRoute(({ params }) => {
	const progress = isJobKey(params.job) ? readProgress(params.job) : undefined;
	if (!progress)
		throw new ApiError(404, { error: 'No running or recent import with that job key.' });
	return json(progress);
});
