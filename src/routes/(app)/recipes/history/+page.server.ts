import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { changedParameters, recipeHistory } from '$lib/server/printlog';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	requireActor(locals);
	const line = url.searchParams.get('line') ?? '';
	const product = url.searchParams.get('product') ?? '';
	const versions = recipeHistory(getDb(), line, product);
	return {
		line,
		product,
		versions: versions.map((v, i) => ({
			...v,
			changed:
				i + 1 < versions.length ? changedParameters(versions[i + 1].parameters, v.parameters) : []
		}))
	};
};
