import { json } from '@sveltejs/kit';
import { apiRoute, parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { listCurrentRecipes, queryObject, recipeHistory, saveRecipe } from '$lib/server/printlog';
import { recipeSchema } from '$lib/schemas/printlog';

/** Current recipes; with ?line=&product= every version of that recipe, newest first. */
export const GET = apiRoute(({ url }) => {
	const { line, product } = queryObject(url);
	if (line && product) return json({ recipes: recipeHistory(getDb(), line, product) });
	return json({ recipes: listCurrentRecipes(getDb()) });
});

/** Create a recipe, or the next version of an existing one. */
export const POST = apiRoute(async ({ request }, actor) => {
	const input = await parseJsonBody(request, recipeSchema);
	return json(saveRecipe(getDb(), input, actor), { status: 201 });
});
