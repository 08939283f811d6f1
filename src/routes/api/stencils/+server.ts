import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { createStencil, listStencils } from '$lib/server/stencils';
import { stencilCreateSchema } from '$lib/schemas/stencil';

export const GET = apiRoute(() => json({ stencils: listStencils(getDb()) }));

export const POST = apiRoute(async ({ request }, actor) => {
	const input = await parseJsonBody(request, stencilCreateSchema);
	const created = createStencil(getDb(), input, actor);
	return json(created, { status: 201 });
});
