import { fail, redirect } from '@sveltejs/kit';
import { superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { ENGINEERING, hasRole } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { createStencil, DuplicateStencilError, listStencils } from '$lib/server/stencils';
import { parseStepRegionsText, stencilFormSchema } from '$lib/schemas/stencil-forms';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const actor = requireActor(locals);
	return {
		stencils: listStencils(getDb()),
		canEdit: hasRole(actor, ENGINEERING),
		form: await superValidate(zod4(stencilFormSchema))
	};
};

export const actions = {
	create: async ({ locals, request }) => {
		const actor = requireActor(locals, ENGINEERING);
		const form = await superValidate(request, zod4(stencilFormSchema));
		if (!form.valid) return fail(400, { form });
		const steps = parseStepRegionsText(form.data.stepRegions);
		if ('error' in steps) {
			form.errors.stepRegions = [steps.error];
			return fail(400, { form });
		}
		let id: number;
		try {
			id = createStencil(getDb(), { ...form.data, stepRegions: steps.regions }, actor).id;
		} catch (err) {
			if (!(err instanceof DuplicateStencilError)) throw err;
			form.errors.revision = [err.message];
			return fail(err.status, { form });
		}
		redirect(303, `/stencils/${id}`);
	}
} satisfies Actions;
