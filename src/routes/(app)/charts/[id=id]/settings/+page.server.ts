import { fail, redirect } from '@sveltejs/kit';
import { SPC_EDITORS } from '$lib/access';
import { getDb } from '$lib/server/db';
import { listLines, listProducts } from '$lib/server/factory';
import { requireActor } from '$lib/server/guards';
import { getCharacteristic } from '$lib/server/spc/chart-service';
import { refusalToError } from '$lib/server/refusals';
import { characteristicFromForm } from '$lib/spc/characteristic-form';
import { CharacteristicInputError, updateCharacteristic } from '$lib/server/spc/characteristics';
import { CHARTABLE_PARAMETERS, MEASURE_DEFAULTS } from '$lib/spc/chart-measures';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params }) => {
	requireActor(locals, SPC_EDITORS);
	const db = getDb();
	try {
		return {
			characteristic: getCharacteristic(db, Number(params.id)),
			products: listProducts(db),
			lines: listLines(db),
			parameters: CHARTABLE_PARAMETERS,
			defaults: MEASURE_DEFAULTS
		};
	} catch (err) {
		refusalToError(err);
	}
};

export const actions = {
	default: async ({ locals, params, request }) => {
		const actor = requireActor(locals, SPC_EDITORS);
		const id = Number(params.id);
		try {
			updateCharacteristic(getDb(), id, characteristicFromForm(await request.formData()), actor);
		} catch (err) {
			if (err instanceof CharacteristicInputError) return fail(422, { errors: err.problems });
			refusalToError(err);
		}
		redirect(303, `/charts/${id}`);
	}
} satisfies Actions;
