import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { searchBoards } from '$lib/server/ingest';

export const GET = apiRoute(({ url }) => {
	const importId = Number(url.searchParams.get('import'));
	const limit = Number(url.searchParams.get('limit'));
	const boards = searchBoards(getDb(), {
		serial: url.searchParams.get('serial'),
		prefix: url.searchParams.get('prefix') === '1' || url.searchParams.get('prefix') === 'true',
		importId: Number.isSafeInteger(importId) && importId > 0 ? importId : null,
		limit: Number.isSafeInteger(limit) && limit > 0 ? limit : 100
	});
	return json({ boards });
});
