import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { failurePareto, inspectedProducts } from '$lib/server/ingest';
import type { PageServerLoad } from './$types';

const DAY_MS = 24 * 60 * 60 * 1000;

function dateParam(value: string | null, fallback: Date): Date {
	const d = value ? new Date(value) : fallback;
	return Number.isNaN(d.getTime()) ? fallback : d;
}

export const load: PageServerLoad = async ({ locals, url }) => {
	requireActor(locals);
	const db = getDb();
	const products = inspectedProducts(db);
	const product = url.searchParams.get('product') ?? products[0] ?? '';
	const toDay = dateParam(url.searchParams.get('to'), new Date());
	const fromDay = dateParam(url.searchParams.get('from'), new Date(toDay.getTime() - 14 * DAY_MS));
	// Whole days: from 00:00 of the first to 24:00 of the last (UTC, as the date inputs give).
	const from = new Date(fromDay.toISOString().slice(0, 10) + 'T00:00:00Z');
	const to = new Date(
		new Date(toDay.toISOString().slice(0, 10) + 'T00:00:00Z').getTime() + DAY_MS - 1
	);
	return {
		products,
		product,
		from: from.toISOString().slice(0, 10),
		to: to.toISOString().slice(0, 10),
		pareto: product ? failurePareto(db, { product, from, to, limit: 20 }) : null
	};
};
