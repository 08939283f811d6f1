import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { failurePareto } from '$lib/server/ingest';

const DAY_MS = 24 * 60 * 60 * 1000;

function instant(value: string | null, name: string, fallback: Date): Date {
	if (value === null || value === '') return fallback;
	const d = new Date(value);
	if (Number.isNaN(d.getTime()))
		throw new ApiError(400, {
			error: `"${name}" must be an ISO 8601 date or date-time, got "${value}".`
		});
	return d;
}

export const GET = apiRoute(({ url }) => {
	const product = url.searchParams.get('product')?.trim();
	if (!product) throw new ApiError(400, { error: 'Give a product code: ?product=PB-100.' });
	const to = instant(url.searchParams.get('to'), 'to', new Date());
	const from = instant(url.searchParams.get('from'), 'from', new Date(to.getTime() - 7 * DAY_MS));
	return json({ product, from, to, ...failurePareto(getDb(), { product, from, to }) });
});
