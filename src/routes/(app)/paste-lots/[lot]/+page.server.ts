import { error, fail } from '@sveltejs/kit';
import { ENGINEERING, hasRole, PRINT_LOGGERS } from '$lib/access';
import { leadHandlingCaution, PASTE_EVENTS } from '$lib/printlog';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { askConfirmation } from '$lib/server/confirm';
import {
	addPasteEvent,
	getPasteLot,
	PrintlogRequestError,
	updatePasteHandling
} from '$lib/server/printlog';
import { fieldErrorsFromZod, pasteEventSchema } from '$lib/schemas/printlog';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	const actor = requireActor(locals);
	const lot = getPasteLot(getDb(), params.lot);
	if (!lot) error(404, `No paste lot "${params.lot}".`);
	return {
		lot,
		events: PASTE_EVENTS,
		caution: lot.leadBearing ? leadHandlingCaution() : [],
		canWrite: hasRole(actor, PRINT_LOGGERS),
		canEditHandling: hasRole(actor, ENGINEERING)
	};
};

export const actions = {
	event: async ({ locals, params, request }) => {
		const actor = requireActor(locals, PRINT_LOGGERS);
		const data = await request.formData();
		const parsed = pasteEventSchema.safeParse({
			event: String(data.get('event') ?? ''),
			...(String(data.get('note') ?? '').trim() && { note: String(data.get('note')) })
		});
		if (!parsed.success) {
			return fail(400, { errors: fieldErrorsFromZod(parsed.error), warnings: [] as string[] });
		}
		if (parsed.data.event === 'discarded') {
			const lot = getPasteLot(getDb(), params.lot);
			const name = lot?.lotNumber ?? params.lot;
			const ask = askConfirmation(data, '?/event', {
				title: `Discard paste lot ${name}?`,
				message: `Lot ${name} is marked discarded for good: no run can use it from now on, and its handling log ends here.`,
				confirmLabel: `Discard ${name}`
			});
			if (ask) return ask;
		}
		try {
			const { warnings } = addPasteEvent(getDb(), params.lot, parsed.data, actor);
			return { logged: parsed.data.event, warnings, errors: [] };
		} catch (err) {
			if (!(err instanceof PrintlogRequestError)) throw err;
			return fail(err.status, { errors: err.fields, warnings: [] as string[] });
		}
	},
	handling: async ({ locals, params, request }) => {
		const actor = requireActor(locals, ENGINEERING);
		const data = await request.formData();
		const overrides: Record<string, unknown> = {};
		for (const key of ['warmUpMinutes', 'maxOnStencilMinutes', 'maxOutOfColdMinutes']) {
			const text = String(data.get(key) ?? '').trim();
			if (text !== '') overrides[key] = Number(text);
		}
		try {
			updatePasteHandling(getDb(), params.lot, overrides, actor);
		} catch (err) {
			if (!(err instanceof PrintlogRequestError)) throw err;
			return fail(err.status, { handlingErrors: err.fields });
		}
		return { handlingSaved: true };
	}
} satisfies Actions;
