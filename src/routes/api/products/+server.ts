import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { createProduct, listProducts } from '$lib/server/factory';
import { productInputSchema } from '$lib/schemas/factory';

export const GET = apiRoute(() => json({ products: listProducts(getDb()) }));

/** 201 with the product; a code already taken is a DuplicateCodeError, answered 409 by apiRoute. */
export const POST = apiRoute(async ({ request }, actor) => {
	const input = await parseJsonBody(request, productInputSchema);
	return json(createProduct(getDb(), input, actor), { status: 201 });
});
