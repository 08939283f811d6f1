import { json } from '@sveltejs/kit';
import { parseJsonBody } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import {
	listCurrentRecipes,
	printlogApiRoute,
	queryObject,
	recipeHistory,
	saveRecipe
} from '$lib/server/printlog';
import { recipeSchema } from '$lib/schemas/printlog';

/** Current recipes; with ?line=&product= every version of that recipe, newest first. */
export const GET = printlogApiRoute(({ url }) => {
	const { line, product } = queryObject(url);
	if (line && product) return json({ recipes: recipeHistory(getDb(), line, product) });
	return json({ recipes: listCurrentRecipes(getDb()) });
});

/** Create a recipe, or the next version of an existing one. */
export const POST = printlogApiRoute(async ({ request }, actor) => {
	const input = await parseJsonBody(request, recipeSchema);
	return json(saveRecipe(getDb(), input, actor), { status: 201 });
});
