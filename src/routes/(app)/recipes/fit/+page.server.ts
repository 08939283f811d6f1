import { fail } from '@sveltejs/kit';
import { ENGINEERING, hasRole } from '$lib/access';
import { BOARD_SIDES, formatFieldError } from '$lib/printlog';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import {
	listProductFit,
	listStencilRefs,
	PrintlogRequestError,
	setProductFit
} from '$lib/server/printlog';
import { fieldErrorsFromZod } from '$lib/schemas/printlog';
import { productFitSchema } from '$lib/schemas/product-fit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const actor = requireActor(locals);
	const db = getDb();
	return {
		products: listProductFit(db),
		stencilNames: [...new Set(listStencilRefs(db).map((s) => s.name))],
		canEdit: hasRole(actor, ENGINEERING)
	};
};

/** Whole powder types from the ticked boxes; anything else is left for the schema to refuse. */
const powderTypesOf = (data: FormData) =>
	data.getAll('powderType').map((v) => (/^\d{1,2}$/.test(String(v)) ? Number(v) : String(v)));

export const actions = {
	default: async ({ locals, request }) => {
		const actor = requireActor(locals, ENGINEERING);
		const data = await request.formData();
		const productId = Number(data.get('productId'));
		if (!Number.isSafeInteger(productId) || productId <= 0) {
			return fail(400, { productId: null, errors: ['productId: must be a product id'] });
		}
		// Each ticked box is "<stencil name>|<side>"; alloys are typed, one per comma.
		const approvals = data.getAll('approval').flatMap((v) => {
			const [stencil, side] = String(v).split('|');
			return BOARD_SIDES.includes(side as never) ? [{ stencil, side }] : [];
		});
		const alloys = String(data.get('alloys') ?? '')
			.split(',')
			.map((a) => a.trim())
			.filter(Boolean);
		const parsed = productFitSchema.safeParse({
			approvals,
			alloys,
			powderTypes: powderTypesOf(data)
		});
		if (!parsed.success) {
			const errors = fieldErrorsFromZod(parsed.error).map(formatFieldError);
			return fail(400, { productId, errors });
		}
		try {
			const saved = setProductFit(getDb(), productId, parsed.data, actor);
			return { productId, saved: `Saved the stencils and pastes of ${saved.product}.` };
		} catch (err) {
			if (!(err instanceof PrintlogRequestError)) throw err;
			return fail(err.status, { productId, errors: err.fields.map(formatFieldError) });
		}
	}
} satisfies Actions;
