import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { listStencilLife, printlogApiRoute, stencilLifeApiView } from '$lib/server/printlog';

/** Every stencil with its print count, rated life, share used, state and latest tension. */
export const GET = printlogApiRoute(() =>
	json({ stencils: listStencilLife(getDb()).map(stencilLifeApiView) })
);
