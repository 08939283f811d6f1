import { hasRole, PRINT_LOGGERS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { listLines, listProducts } from '$lib/server/factory';
import { requireActor } from '$lib/server/guards';
import { listRuns, openRuns } from '$lib/server/printlog';
import { runFiltersSchema, toRunFilters } from '$lib/schemas/printlog-forms';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireActor(locals);
	const db = getDb();
	const raw = Object.fromEntries([...url.searchParams].filter(([, v]) => v.trim() !== ''));
	const parsed = runFiltersSchema.safeParse(raw);
	const filters = parsed.success ? parsed.data : {};
	const filterErrors = parsed.success
		? []
		: parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
	return {
		filters: {
			line: raw.line ?? '',
			product: raw.product ?? '',
			stencil: raw.stencil ?? '',
			lot: raw.lot ?? '',
			from: raw.from ?? '',
			to: raw.to ?? ''
		},
		filterErrors,
		runs: listRuns(db, { ...toRunFilters(filters), limit: 200 }),
		openRuns: openRuns(db),
		lines: listLines(db),
		products: listProducts(db),
		canLog: hasRole(actor, PRINT_LOGGERS),
		query: url.search
	};
};
