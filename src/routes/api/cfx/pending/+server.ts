import { json } from '@sveltejs/kit';
import { apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { listPendingInspections } from '$lib/server/cfx';

/** Inspected units whose product could not be told, waiting for a product. */
export const GET = apiRoute(() => json({ units: listPendingInspections(getDb()) }));
