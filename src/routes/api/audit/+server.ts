import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { listAudit } from '$lib/server/audit';
import { auditQueryParams, auditQuerySchema } from '$lib/schemas/audit';

/**
 * The audit trail, newest first: `?user=ID&kind=KIND&from=DATE&to=DATE&page=N&pageSize=N`
 * (all optional; dates YYYY-MM-DD are whole UTC days). Read only: the app has no route that
 * edits or deletes entries.
 */
export const GET = apiRoute(({ url }) => {
	const query = auditQuerySchema.parse(auditQueryParams(url));
	return json(listAudit(getDb(), query));
});
