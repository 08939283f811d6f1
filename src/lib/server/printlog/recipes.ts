import { and, asc, desc, eq, sql } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import type { RecipeParameters } from '$lib/printlog';
import type { RecipePayload } from '$lib/schemas/printlog';
import { recordAudit } from '../audit';
import type { Db } from '../db';
import { lines, printRecipes, products, users } from '../db/schema';
import { resolveLineProduct } from './lookups';
import { PrintlogRequestError, refuseIfAny } from './request-error';

/** One recipe version as the pages and the API show it. */
export type RecipeVersion = {
	id: number;
	line: string;
	product: string;
	version: number;
	parameters: RecipeParameters;
	/** Ideal cycle time of one board, s (for OEE); null: not set. */
	idealCycleTimeS: number | null;
	note: string;
	createdAt: Date;
	createdBy: string | null;
};

const columns = {
	id: printRecipes.id,
	line: lines.code,
	product: products.code,
	version: printRecipes.version,
	parameters: printRecipes.parameters,
	idealCycleTimeMs: printRecipes.idealCycleTimeMs,
	note: printRecipes.note,
	createdAt: printRecipes.createdAt,
	createdBy: users.name
};

function baseQuery(db: Db) {
	return db
		.select(columns)
		.from(printRecipes)
		.innerJoin(lines, eq(lines.id, printRecipes.lineId))
		.innerJoin(products, eq(products.id, printRecipes.productId))
		.leftJoin(users, eq(users.id, printRecipes.createdByUserId));
}

const asVersion = ({
	idealCycleTimeMs,
	...row
}: { parameters: Record<string, unknown>; idealCycleTimeMs: number | null } & Omit<
	RecipeVersion,
	'parameters' | 'idealCycleTimeS'
>) =>
	({
		...row,
		parameters: row.parameters as RecipeParameters,
		idealCycleTimeS: idealCycleTimeMs === null ? null : idealCycleTimeMs / 1000
	}) as RecipeVersion;

/** The newest version of every recipe, by line then product. */
export function listCurrentRecipes(db: Db): RecipeVersion[] {
	const newest = db
		.select({ id: sql<number>`max(${printRecipes.id})`.as('newest_id') })
		.from(printRecipes)
		.groupBy(printRecipes.lineId, printRecipes.productId)
		.as('newest');
	return baseQuery(db)
		.innerJoin(newest, eq(newest.id, printRecipes.id))
		.orderBy(asc(lines.code), asc(products.code))
		.all()
		.map(asVersion);
}

/** The current (newest) recipe version for a line and product ids, if any. */
export function currentRecipeFor(
	db: Db,
	lineId: number,
	productId: number
): RecipeVersion | undefined {
	const row = baseQuery(db)
		.where(and(eq(printRecipes.lineId, lineId), eq(printRecipes.productId, productId)))
		.orderBy(desc(printRecipes.version))
		.get();
	return row && asVersion(row);
}

/** Every version of one recipe, newest first (for the history and the diff). */
export function recipeHistory(db: Db, line: string, product: string): RecipeVersion[] {
	const { line: l, product: p } = resolveLineProduct(db, { line, product });
	if (!l || !p) return [];
	return baseQuery(db)
		.where(and(eq(printRecipes.lineId, l.id), eq(printRecipes.productId, p.id)))
		.orderBy(desc(printRecipes.version))
		.all()
		.map(asVersion);
}

/** One recipe version by id. */
export function recipeById(db: Db, id: number): RecipeVersion | undefined {
	const row = baseQuery(db).where(eq(printRecipes.id, id)).get();
	return row && asVersion(row);
}

/**
 * Save a recipe: the first one for a line and product is version 1; saving again creates the
 * next version (nothing is overwritten) and the audit log records the old and new windows.
 * @throws PrintlogRequestError 422 for unknown line or product codes; 409 when the parameters
 *   are identical to the current version (no new version is made).
 */
export function saveRecipe(
	db: Db,
	input: RecipePayload & { note?: string },
	actor: Actor | null
): RecipeVersion {
	const { line, product, errors } = resolveLineProduct(db, input);
	refuseIfAny(errors);
	return db.transaction((tx) => {
		const current = currentRecipeFor(tx as unknown as Db, line!.id, product!.id);
		const parameters = stripUndefined(input.parameters);
		// Omitted: the current version's ideal cycle time carries over (the edit page has no field).
		const idealCycleTimeS =
			input.idealCycleTimeS === undefined
				? (current?.idealCycleTimeS ?? null)
				: input.idealCycleTimeS;
		if (
			current &&
			sameParameters(current.parameters, parameters) &&
			current.idealCycleTimeS === idealCycleTimeS
		) {
			throw new PrintlogRequestError(409, [
				{
					field: 'parameters',
					message: `are the same as version ${current.version}; nothing to save`
				}
			]);
		}
		const version = (current?.version ?? 0) + 1;
		const row = tx
			.insert(printRecipes)
			.values({
				lineId: line!.id,
				productId: product!.id,
				version,
				parameters,
				idealCycleTimeMs: idealCycleTimeS === null ? null : Math.round(idealCycleTimeS * 1000),
				note: input.note?.trim() ?? '',
				createdByUserId: actor?.kind === 'user' ? actor.id : null
			})
			.returning({ id: printRecipes.id })
			.get();
		recordAudit(tx, actor, {
			action: current ? 'new-version' : 'create',
			entity: 'print_recipe',
			entityId: row.id,
			before: current
				? {
						line: line!.code,
						product: product!.code,
						version: current.version,
						parameters: current.parameters
					}
				: null,
			after: { line: line!.code, product: product!.code, version, parameters, idealCycleTimeS }
		});
		return recipeById(tx as unknown as Db, row.id)!;
	});
}

/** The parameters whose window or value differs between two versions (for the history view). */
export function changedParameters(before: RecipeParameters, after: RecipeParameters): string[] {
	const keys = new Set([...Object.keys(before), ...Object.keys(after)]);
	return [...keys].filter(
		(key) =>
			JSON.stringify((before as Record<string, unknown>)[key]) !==
			JSON.stringify((after as Record<string, unknown>)[key])
	);
}

function sameParameters(a: RecipeParameters, b: RecipeParameters): boolean {
	return changedParameters(a, b).length === 0;
}

function stripUndefined(parameters: Record<string, unknown>): Record<string, unknown> {
	return Object.fromEntries(Object.entries(parameters).filter(([, v]) => v !== undefined));
}
