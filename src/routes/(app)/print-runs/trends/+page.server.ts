import { getDb } from '$lib/server/db';
import { listLines, listProducts } from '$lib/server/factory';
import { requireActor } from '$lib/server/guards';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	requireActor(locals);
	const db = getDb();
	return {
		lines: listLines(db),
		products: listProducts(db),
		line: url.searchParams.get('line') ?? '',
		product: url.searchParams.get('product') ?? ''
	};
};
