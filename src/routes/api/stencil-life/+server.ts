import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { listStencilLife, stencilLifeApiView } from '$lib/server/printlog';

/** Every stencil with its print count, rated life, share used, state and latest tension. */
export const GET = apiRoute(() =>
	json({ stencils: listStencilLife(getDb()).map(stencilLifeApiView) })
);
