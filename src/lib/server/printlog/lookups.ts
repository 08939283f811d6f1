import { asc, desc, eq, sql } from 'drizzle-orm';
import { normaliseScannedCode, type FieldError } from '$lib/printlog';
import type { Db } from '../db';
import type { SQLiteColumn } from 'drizzle-orm/sqlite-core';
import { lines, pasteLots, products, stencils } from '../db/schema';

/** A line or product as the print log refers to it. */
export type CodeRef = { id: number; code: string; name: string };

/** A stencil as the run form needs it (print count is added by stencil-life). */
export type StencilRef = {
	id: number;
	name: string;
	revision: string;
	state: string;
	ratedLifePrints: number | null;
};

/** Codes compare like a scanner reads them: trimmed, AIM prefix dropped, case ignored. */
const same = (column: SQLiteColumn, code: string) =>
	sql`upper(trim(${column})) = ${normaliseScannedCode(code)}`;

/** Find a line by code (case-insensitive). */
export function lineByCode(db: Db, code: string): CodeRef | undefined {
	return db
		.select({ id: lines.id, code: lines.code, name: lines.name })
		.from(lines)
		.where(same(lines.code, code))
		.get();
}

/** Find a product by code (case-insensitive). */
export function productByCode(db: Db, code: string): CodeRef | undefined {
	return db
		.select({ id: products.id, code: products.code, name: products.name })
		.from(products)
		.where(same(products.code, code))
		.get();
}

const stencilColumns = {
	id: stencils.id,
	name: stencils.name,
	revision: stencils.revision,
	state: stencils.state,
	ratedLifePrints: stencils.ratedLifePrints
};

/**
 * Find a stencil by the name on its label. Revisions share a name: the newest revision that is
 * not retired wins, else the newest one (so a scan of a retired stencil is refused by name).
 */
export function stencilByName(db: Db, name: string): StencilRef | undefined {
	const rows = db
		.select(stencilColumns)
		.from(stencils)
		.where(same(stencils.name, name))
		.orderBy(desc(stencils.id))
		.all();
	return rows.find((row) => row.state !== 'retired') ?? rows[0];
}

/** Every stencil, for scan matching and lists. */
export function listStencilRefs(db: Db): StencilRef[] {
	return db
		.select(stencilColumns)
		.from(stencils)
		.orderBy(asc(stencils.name), desc(stencils.id))
		.all();
}

/** Find a paste lot id by lot number (case-insensitive). */
export function pasteLotIdByNumber(db: Db, lotNumber: string): number | undefined {
	return db
		.select({ id: pasteLots.id })
		.from(pasteLots)
		.where(same(pasteLots.lotNumber, lotNumber))
		.get()?.id;
}

/**
 * Resolve the line and product codes of a request, collecting a field error for each unknown one.
 * @example resolveLineProduct(db, { line: 'SMT-1', product: 'PB-100' }).errors // []
 */
export function resolveLineProduct(
	db: Db,
	input: { line: string; product: string }
): { line?: CodeRef; product?: CodeRef; errors: FieldError[] } {
	const errors: FieldError[] = [];
	const line = lineByCode(db, input.line);
	const product = productByCode(db, input.product);
	if (!line) errors.push({ field: 'line', message: `no line has the code "${input.line}"` });
	if (!product) {
		errors.push({ field: 'product', message: `no product has the code "${input.product}"` });
	}
	return { line, product, errors };
}

/** Look a line id up (for messages). */
export function lineCodeById(db: Db, id: number): string {
	return (
		db.select({ code: lines.code }).from(lines).where(eq(lines.id, id)).get()?.code ?? `#${id}`
	);
}
