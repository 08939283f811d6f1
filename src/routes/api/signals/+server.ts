import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { signalJson, signalQuery } from '$lib/spc/api-json';
import { listSignals } from '$lib/server/spc/signals';

/** Stored signals, newest first (`?status=open|acknowledged`, `chart`, `rule`, `limit`). */
export const GET = apiRoute(({ url }) =>
	json({ signals: listSignals(getDb(), signalQuery(url)).map(signalJson) })
);
