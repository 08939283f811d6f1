import { json } from '@sveltejs/kit';
import { ApiError, apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { createProduct, DuplicateCodeError, listProducts } from '$lib/server/factory';
import { productInputSchema } from '$lib/schemas/factory';

export const GET = apiRoute(() => json({ products: listProducts(getDb()) }));

export const POST = apiRoute(async ({ request }, actor) => {
	const input = await parseJsonBody(request, productInputSchema);
	try {
		return json(createProduct(getDb(), input, actor), { status: 201 });
	} catch (err) {
		if (err instanceof DuplicateCodeError) throw new ApiError(409, { error: err.message });
		throw err;
	}
});
