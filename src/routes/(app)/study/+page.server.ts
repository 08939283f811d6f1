import { fail } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { getCapabilityThresholds } from '$lib/server/spc/capability-settings';
import { parseStudyForm } from '$lib/spc/study-form';
import { studyView } from '$lib/spc/study-view';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals);
	return {};
};

export const actions = {
	analyze: async ({ locals, request }) => {
		requireActor(locals);
		const parsed = parseStudyForm(await request.formData());
		if (!parsed.ok) return fail(422, { values: parsed.values, errors: parsed.errors });
		const outcome = studyView(parsed.request, parsed.values.unit, getCapabilityThresholds(getDb()));
		if (!outcome.ok)
			return fail(422, { values: parsed.values, errors: outcome.errors.map(parsed.where) });
		return {
			values: parsed.values,
			errors: [],
			chart: outcome.chart,
			capability: outcome.capability
		};
	}
} satisfies Actions;
