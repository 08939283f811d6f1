import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { hasRole, PRINT_LOGGERS } from '$lib/access';
import { DEFAULT_PASTE_HANDLING } from '$lib/printlog';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { createPasteLot, listPasteLots, PrintlogRequestError } from '$lib/server/printlog';
import { pasteLotSchema } from '$lib/schemas/printlog';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const actor = requireActor(locals);
	return {
		lots: listPasteLots(getDb()).map(({ events, ...lot }) => ({
			...lot,
			eventCount: events.length
		})),
		defaults: DEFAULT_PASTE_HANDLING,
		canWrite: hasRole(actor, PRINT_LOGGERS),
		form: await superValidate(zod4(pasteLotSchema), { errors: false })
	};
};

export const actions = {
	create: async ({ locals, request }) => {
		const actor = requireActor(locals, PRINT_LOGGERS);
		const form = await superValidate(request, zod4(pasteLotSchema));
		if (!form.valid) return fail(400, { form });
		let lotNumber: string;
		try {
			lotNumber = createPasteLot(getDb(), form.data, actor).lotNumber;
		} catch (err) {
			if (!(err instanceof PrintlogRequestError)) throw err;
			if (err.extra.needsConfirmation) {
				// Odd but possible dates: say why beside each date and ask for a confirmation.
				for (const f of err.fields) {
					const key = f.field as 'expiresOn' | 'receivedOn';
					form.errors[key] = [...(form.errors[key] ?? []), `Check: ${f.message}.`];
				}
				return fail(err.status, { form, needsConfirmation: true });
			}
			form.errors.lotNumber = err.fields.map((f) => f.message);
			return fail(err.status, { form });
		}
		redirect(303, `/paste-lots/${encodeURIComponent(lotNumber)}?created=1`);
	}
} satisfies Actions;
