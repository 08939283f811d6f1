import { AUDIT_READERS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { auditFilterChoices, listAudit } from '$lib/server/audit';
import { auditQueryParams, auditQuerySchema } from '$lib/schemas/audit';
import type { PageServerLoad } from './$types';

/** Read only: this page has no actions, and no route edits or deletes audit entries. */
export const load: PageServerLoad = ({ locals, url }) => {
	requireActor(locals, AUDIT_READERS);
	const db = getDb();
	const params = auditQueryParams(url);
	const parsed = auditQuerySchema.safeParse(params);
	const problems = parsed.success ? [] : parsed.error.issues.map((i) => i.message);
	const query = parsed.success ? parsed.data : {};
	const { page: _page, pageSize: _size, ...filters } = params;
	return {
		...listAudit(db, query),
		...auditFilterChoices(db),
		filters,
		problems,
		csvQuery: new URLSearchParams(parsed.success ? filters : {}).toString()
	};
};
