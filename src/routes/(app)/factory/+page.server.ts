import { fail } from '@sveltejs/kit';
import { message, superValidate } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { ENGINEERING, hasRole } from '$lib/access';
import { getDb } from '$lib/server/db';
import {
	createLine,
	createProduct,
	DuplicateCodeError,
	listLines,
	listProducts
} from '$lib/server/factory';
import { requireActor } from '$lib/server/guards';
import { lineInputSchema, productInputSchema } from '$lib/schemas/factory';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals }) => {
	const actor = requireActor(locals);
	const db = getDb();
	return {
		lines: listLines(db),
		products: listProducts(db),
		canEdit: hasRole(actor, ENGINEERING),
		lineForm: await superValidate(zod4(lineInputSchema), { id: 'line' }),
		productForm: await superValidate(zod4(productInputSchema), { id: 'product' })
	};
};

export const actions = {
	addLine: async ({ locals, request }) => {
		const actor = requireActor(locals, ENGINEERING);
		const form = await superValidate(request, zod4(lineInputSchema), { id: 'line' });
		if (!form.valid) return fail(400, { form });
		try {
			const line = createLine(getDb(), form.data, actor);
			return message(form, `Line ${line.code} added.`);
		} catch (err) {
			if (!(err instanceof DuplicateCodeError)) throw err;
			form.errors.code = [err.message];
			return fail(409, { form });
		}
	},
	addProduct: async ({ locals, request }) => {
		const actor = requireActor(locals, ENGINEERING);
		const form = await superValidate(request, zod4(productInputSchema), { id: 'product' });
		if (!form.valid) return fail(400, { form });
		try {
			const product = createProduct(getDb(), form.data, actor);
			return message(form, `Product ${product.code} added.`);
		} catch (err) {
			if (!(err instanceof DuplicateCodeError)) throw err;
			form.errors.code = [err.message];
			return fail(409, { form });
		}
	}
} satisfies Actions;
