import { fail } from '@sveltejs/kit';
import { hasRole, SPC_EDITORS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { signalJson, signalQuery } from '$lib/spc/api-json';
import { getCauseLists, setCauseList } from '$lib/server/spc/cause-lists';
import { listCharacteristics } from '$lib/server/spc/chart-service';
import { listSignals } from '$lib/server/spc/signals';
import { acknowledgeFromForm } from '$lib/server/spc/acknowledge';
import { patternScopeCounts } from '$lib/server/spc/ack-scope';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireActor(locals);
	const db = getDb();
	const filters = signalQuery(url);
	const signals = listSignals(db, filters);
	const counts = patternScopeCounts(
		db,
		signals.filter((s) => s.status === 'open').map((s) => s.id)
	);
	return {
		filters: {
			status: filters.status ?? 'all',
			chart: filters.characteristicId ?? null,
			rule: filters.rule ?? ''
		},
		signals: signals.map(signalJson),
		/** Open signals a "whole pattern" acknowledgement of each signal would close. */
		patternCounts: Object.fromEntries(counts),
		charts: listCharacteristics(db).map((c) => ({ id: c.id, name: c.name })),
		lists: getCauseLists(db),
		canEdit: hasRole(actor, SPC_EDITORS)
	};
};

export const actions = {
	acknowledge: async ({ locals, request }) => {
		const actor = requireActor(locals, SPC_EDITORS);
		const out = acknowledgeFromForm(getDb(), await request.formData(), actor);
		return out.ok ? out.body : fail(out.status, out.body);
	},
	lists: async ({ locals, request }) => {
		const actor = requireActor(locals, SPC_EDITORS);
		const form = await request.formData();
		const split = (name: string) => String(form.get(name) ?? '').split(/\r?\n/);
		try {
			setCauseList(getDb(), 'causes', split('causes'), actor);
			setCauseList(getDb(), 'actions', split('actions'), actor);
		} catch (err) {
			return fail(422, { action: 'lists', error: (err as Error).message });
		}
		return { action: 'lists', ok: 'Lists saved.' };
	}
} satisfies Actions;
