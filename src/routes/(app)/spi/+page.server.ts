import { hasRole, INSPECTION_IMPORTERS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { listImports } from '$lib/server/ingest';
import type { PageServerLoad } from './$types';

const PAGE = 50;

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireActor(locals);
	const before = Number(url.searchParams.get('before'));
	const imports = listImports(getDb(), {
		before: Number.isSafeInteger(before) && before > 0 ? before : null,
		limit: PAGE + 1
	});
	return {
		imports: imports.slice(0, PAGE),
		nextBefore: imports.length > PAGE ? imports[PAGE - 1].id : null,
		canImport: hasRole(actor, INSPECTION_IMPORTERS)
	};
};
