import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { searchBoards } from '$lib/server/ingest';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	requireActor(locals);
	const serial = url.searchParams.get('serial')?.trim() ?? '';
	const prefix = url.searchParams.get('prefix') === '1';
	const t0 = performance.now();
	const boards = searchBoards(getDb(), { serial: serial || null, prefix, limit: 200 });
	return { serial, prefix, boards, searched: serial !== '', ms: performance.now() - t0 };
};
