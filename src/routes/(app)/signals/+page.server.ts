import { fail } from '@sveltejs/kit';
import { hasRole, SPC_EDITORS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { signalJson, signalQuery } from '$lib/server/spc/api-shapes';
import { getCauseLists, setCauseList } from '$lib/server/spc/cause-lists';
import { listCharacteristics } from '$lib/server/spc/chart-service';
import { acknowledgeSignal, AcknowledgeError, listSignals } from '$lib/server/spc/signals';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const actor = requireActor(locals);
	const db = getDb();
	const filters = signalQuery(url);
	return {
		filters: { status: filters.status ?? 'all', chart: filters.characteristicId ?? null, rule: filters.rule ?? '' },
		signals: listSignals(db, filters).map(signalJson),
		charts: listCharacteristics(db).map((c) => ({ id: c.id, name: c.name })),
		lists: getCauseLists(db),
		canEdit: hasRole(actor, SPC_EDITORS)
	};
};

export const actions = {
	acknowledge: async ({ locals, request }) => {
		const actor = requireActor(locals, SPC_EDITORS);
		const form = await request.formData();
		const id = Number(form.get('id'));
		const input = {
			cause: String(form.get('cause') ?? ''),
			action: String(form.get('action') ?? ''),
			note: String(form.get('note') ?? ''),
			wholeRun: form.get('wholeRun') === 'on'
		};
		try {
			const done = acknowledgeSignal(getDb(), id, input, actor);
			return { action: 'acknowledge', id, ok: `Acknowledged ${done.length} signal${done.length === 1 ? '' : 's'}.` };
		} catch (err) {
			if (err instanceof AcknowledgeError) {
				return fail(err.status, { action: 'acknowledge', id, field: err.field ?? 'cause', error: err.message });
			}
			throw err;
		}
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
