import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { openStream } from '$lib/server/floor/live';

/**
 * Server-sent events of the line overview (`line`, `signal`, `heartbeat`); resumes after the
 * `Last-Event-ID` header (or `?lastEventId=` for clients that cannot set it).
 */
export const GET = apiRoute(({ request, url }) =>
	openStream(getDb(), request.headers.get('last-event-id') ?? url.searchParams.get('lastEventId'))
);
