import { getDb } from '$lib/server/db';
import { listLines, listProducts } from '$lib/server/factory';
import { requireActor } from '$lib/server/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	requireActor(locals);
	const db = getDb();
	return { lineCount: listLines(db).length, productCount: listProducts(db).length };
};
