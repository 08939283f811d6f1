import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { getProductFit, setProductFit } from '$lib/server/printlog';
import { productFitSchema } from '$lib/schemas/product-fit';

/** One product's approved stencils (with sides) and allowed alloys and powder types. */
export const GET = apiRoute(({ params }) => json(getProductFit(getDb(), Number(params.id))));

/** Replace them (engineers, admins): 200 with the new rules; 404 product; 422 unknown stencil. */
export const PUT = apiRoute(async ({ params, request }, actor) => {
	const input = await parseJsonBody(request, productFitSchema);
	return json(setProductFit(getDb(), Number(params.id), input, actor));
});
