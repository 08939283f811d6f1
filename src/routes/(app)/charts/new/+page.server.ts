import { fail, redirect } from '@sveltejs/kit';
import { SPC_EDITORS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { listLines, listProducts } from '$lib/server/factory';
import { requireActor } from '$lib/server/guards';
import { characteristicFromForm } from '$lib/spc/characteristic-form';
import { createCharacteristic, CharacteristicInputError } from '$lib/server/spc/characteristics';
import { CHARTABLE_PARAMETERS, MEASURE_DEFAULTS } from '$lib/spc/chart-measures';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	requireActor(locals, SPC_EDITORS);
	const db = getDb();
	return {
		products: listProducts(db),
		lines: listLines(db),
		parameters: CHARTABLE_PARAMETERS,
		defaults: MEASURE_DEFAULTS
	};
};

export const actions = {
	default: async ({ locals, request }) => {
		const actor = requireActor(locals, SPC_EDITORS);
		let id: number;
		try {
			id = createCharacteristic(
				getDb(),
				characteristicFromForm(await request.formData()),
				actor
			).id;
		} catch (err) {
			if (err instanceof CharacteristicInputError) return fail(422, { errors: err.problems });
			throw err;
		}
		redirect(303, `/charts/${id}`);
	}
} satisfies Actions;
