import { fail } from '@sveltejs/kit';
import { ENGINEERING, hasRole } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { saveSiteThresholds, siteThresholds } from '$lib/server/stencils';
import { thresholdsFormSchema } from '$lib/schemas/stencil-forms';
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
		const parsed = thresholdsFormSchema.safeParse(values);
		if (!parsed.success) {
			const errors: Record<string, string> = {};
			for (const issue of parsed.error.issues) errors[issue.path.join('.')] = issue.message;
			return fail(400, { errors, values });
		}
		saveSiteThresholds(getDb(), parsed.data, actor);
		return { saved: true };
	}
} satisfies Actions;
