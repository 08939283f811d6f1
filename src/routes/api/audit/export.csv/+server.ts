import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { auditCsv } from '$lib/server/audit';
import { auditQueryParams, auditQuerySchema } from '$lib/schemas/audit';
import { csvResponse } from '$lib/csv/write-csv';

/** The filtered trail as CSV (same filters as GET /api/audit, newest 20,000 entries at most). */
export const GET = apiRoute(({ url }) => {
	const query = auditQuerySchema.parse(auditQueryParams(url));
	return csvResponse(
		auditCsv(getDb(), { ...query, page: undefined, pageSize: undefined }),
		'rollbead-audit.csv'
	);
});
