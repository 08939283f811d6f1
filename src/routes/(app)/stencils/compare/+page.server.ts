import { error } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { compareStoredRevisions, findStencil } from '$lib/server/stencils';
import type { PageServerLoad } from './$types';

/** Rows shown per list; the counts are always complete. */
const SHOWN = 500;

export const load: PageServerLoad = ({ locals, url }) => {
	requireActor(locals);
	const oldId = Number(url.searchParams.get('old'));
	const newId = Number(url.searchParams.get('new'));
	const db = getDb();
	if (!findStencil(db, oldId) || !findStencil(db, newId))
		error(404, 'Choose two existing stencils to compare (?old=…&new=…).');
	const { old, new: next, comparison } = compareStoredRevisions(db, oldId, newId);
	return {
		old,
		new: next,
		counts: {
			added: comparison.added.length,
			removed: comparison.removed.length,
			changed: comparison.changed.length,
			unchanged: comparison.unchangedCount
		},
		note: comparison.note ?? null,
		changed: comparison.changed.slice(0, SHOWN),
		added: comparison.added.slice(0, SHOWN).map((a) => a.aperture),
		removed: comparison.removed.slice(0, SHOWN).map((a) => a.aperture),
		shown: SHOWN
	};
};
