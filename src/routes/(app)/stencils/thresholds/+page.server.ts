import { fail } from '@sveltejs/kit';
import { ENGINEERING, hasRole } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { checkSiteThresholds, saveSiteThresholds, siteThresholds } from '$lib/server/stencils';
import { DEFAULT_THRESHOLDS, STENCIL_TECHNOLOGIES } from '$lib/stencil';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	const actor = requireActor(locals);
	return {
		thresholds: siteThresholds(getDb()),
		defaults: DEFAULT_THRESHOLDS,
		canEdit: hasRole(actor, ENGINEERING)
	};
};

export const actions = {
	save: async ({ locals, request }) => {
		const actor = requireActor(locals, ENGINEERING);
		const form = await request.formData();
		// Inputs are named "<technology>.<limit>"; an empty or non-numeric value stays NaN and is refused.
		const values: Record<string, Record<string, number | string>> = {};
		for (const t of STENCIL_TECHNOLOGIES)
			values[t] = Object.fromEntries(
				(['minAreaRatio', 'minAspectRatio'] as const).map((k) => {
					const raw = String(form.get(`${t}.${k}`) ?? '').trim();
					return [k, raw === '' ? raw : Number(raw)];
				})
			);
		const checked = checkSiteThresholds(values);
		if ('errors' in checked) {
			const errors: Record<string, string> = {};
			for (const e of checked.errors) errors[e.field] = e.message;
			return fail(400, { errors, values });
		}
		saveSiteThresholds(getDb(), checked.thresholds, actor);
		return { saved: true };
	}
} satisfies Actions;
