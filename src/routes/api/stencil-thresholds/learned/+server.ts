import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { STENCIL_TECHNOLOGIES } from '$lib/stencil';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import {
	adoptLearnedLimit,
	learnedLimits,
	QueryReader,
	DEFAULT_TE_FLOOR
} from '$lib/server/analysis';

/** Each technology's learned minimum area ratio (TE fit at `?floor=`, default 0.7) beside the limit in force. */
export const GET = apiRoute(async ({ url }) => {
	const q = new QueryReader(url, ['floor']);
	const floor = q.decimal('floor', 0, 1.5, DEFAULT_TE_FLOOR);
	q.finish();
	return json({ floor, limits: await learnedLimits(getDb(), floor) });
});

const adoptBody = z.strictObject({
	technology: z.enum(STENCIL_TECHNOLOGIES),
	floor: z.number().gt(0).lt(1.5).default(DEFAULT_TE_FLOOR),
	/** The value the engineer approved: 409 and nothing saved when the data now give another. */
	expectedMinAreaRatio: z.number().gt(0).lte(10).optional()
});

/** Adopt one technology's learned limit (engineers; computed again here, audited before/after). */
export const POST = apiRoute(async ({ request }, actor) => {
	const body = await parseJsonBody(request, adoptBody);
	const db = getDb();
	const adopted = await adoptLearnedLimit(
		db,
		{
			technology: body.technology,
			paste: null,
			powder: null,
			fromMs: null,
			toMs: null,
			floor: body.floor
		},
		actor,
		{ expectedMinAreaRatio: body.expectedMinAreaRatio }
	);
	const { thresholds, ...rest } = adopted;
	return json({ adopted: rest, thresholds });
});
