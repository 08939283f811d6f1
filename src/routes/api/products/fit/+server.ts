import { json } from '@sveltejs/kit';
import { getDb } from '$lib/server/db';
import { listProductFit, printlogApiRoute } from '$lib/server/printlog';

/** Every product's approved stencils and allowed pastes, by product code. */
export const GET = printlogApiRoute(() => json({ products: listProductFit(getDb()) }));
