import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { getImport, searchBoards } from '$lib/server/ingest';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	requireActor(locals);
	const id = Number(params.id);
	const record = getImport(getDb(), id);
	if (!record) error(404, `No SPI import ${params.id}.`);
	return {
		record,
		boards: record.status === 'imported' ? searchBoards(getDb(), { importId: id, limit: 200 }) : []
	};
};
