import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { listProductFit } from '$lib/server/printlog';

/** Every product's approved stencils and allowed pastes, by product code. */
export const GET = apiRoute(() => json({ products: listProductFit(getDb()) }));
