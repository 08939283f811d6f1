import { asc, eq } from 'drizzle-orm';
import type { Db } from './db';
import { lines, products } from './db/schema';
import { recordAudit } from './audit';
import type { Actor } from '$lib/access';
import type { CodeNameInput } from '$lib/schemas/factory';
import { Refusal } from '$lib/errors';

export type FactoryItem = { id: number; code: string; name: string; active: boolean };

const columns = (t: typeof lines | typeof products) => ({
	id: t.id,
	code: t.code,
	name: t.name,
	active: t.active
});

export function listLines(db: Db): FactoryItem[] {
	return db.select(columns(lines)).from(lines).orderBy(asc(lines.code)).all();
}

export function listProducts(db: Db): FactoryItem[] {
	return db.select(columns(products)).from(products).orderBy(asc(products.code)).all();
}

export function findLineByCode(db: Db, code: string): FactoryItem | undefined {
	return db.select(columns(lines)).from(lines).where(eq(lines.code, code)).get();
}

export function findProductByCode(db: Db, code: string): FactoryItem | undefined {
	return db.select(columns(products)).from(products).where(eq(products.code, code)).get();
}

export class DuplicateCodeError extends Refusal {
	readonly status = 409;
	constructor(
		readonly what: string,
		readonly code: string
	) {
		super(`A ${what} with the code "${code}" already exists.`);
	}
}

function createItem(
	db: Db,
	table: typeof lines | typeof products,
	what: 'line' | 'product',
	input: CodeNameInput,
	actor: Actor | null
): FactoryItem {
	return db.transaction((tx) => {
		if (tx.select({ id: table.id }).from(table).where(eq(table.code, input.code)).get()) {
			throw new DuplicateCodeError(what, input.code);
		}
		const row = tx.insert(table).values(input).returning(columns(table)).get();
		recordAudit(tx, actor, { action: 'create', entity: what, entityId: row.id, after: row });
		return row;
	});
}

export const createLine = (db: Db, input: CodeNameInput, actor: Actor | null) =>
	createItem(db, lines, 'line', input, actor);

export const createProduct = (db: Db, input: CodeNameInput, actor: Actor | null) =>
	createItem(db, products, 'product', input, actor);
