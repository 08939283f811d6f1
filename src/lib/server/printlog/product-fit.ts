import { asc, eq } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import {
	normaliseAlloy,
	normaliseScannedCode,
	type BoardSide,
	type FieldError,
	type ProductFitRules
} from '$lib/printlog';
import type { ProductFitPayload } from '$lib/schemas/product-fit';
import { recordAudit } from '../audit';
import type { Db } from '../db';
import { productPasteAllowances, products, productStencilApprovals } from '../db/schema';
import { listStencilRefs } from './lookups';
import { PrintlogRequestError } from './request-error';
import { unknownCode } from './scanned-codes';

/** A product's fit rules with its id and name, as pages and the API show them. */
export type ProductFitView = ProductFitRules & { productId: number; name: string };

/** The stencils approved for a product and the pastes it allows. */
export function productFitRules(db: Db, product: { id: number; code: string }): ProductFitRules {
	const approvals = db
		.select({
			stencilName: productStencilApprovals.stencilName,
			side: productStencilApprovals.side
		})
		.from(productStencilApprovals)
		.where(eq(productStencilApprovals.productId, product.id))
		.orderBy(asc(productStencilApprovals.stencilName), asc(productStencilApprovals.side))
		.all()
		.map((a) => ({ stencilName: a.stencilName, side: a.side as BoardSide }));
	const allowances = db
		.select({ kind: productPasteAllowances.kind, value: productPasteAllowances.value })
		.from(productPasteAllowances)
		.where(eq(productPasteAllowances.productId, product.id))
		.orderBy(asc(productPasteAllowances.value))
		.all();
	return {
		product: product.code,
		approvals,
		alloys: allowances.filter((a) => a.kind === 'alloy').map((a) => a.value),
		powderTypes: allowances
			.filter((a) => a.kind === 'powder-type')
			.map((a) => Number(a.value))
			.sort((a, b) => a - b)
	};
}

/** Every product's fit rules, by product code. */
export function listProductFit(db: Db): ProductFitView[] {
	return db
		.select({ id: products.id, code: products.code, name: products.name })
		.from(products)
		.orderBy(asc(products.code))
		.all()
		.map((p) => ({ ...productFitRules(db, p), productId: p.id, name: p.name }));
}

/** One product's fit rules by id, or a 404 refusal. */
export function getProductFit(db: Db, productId: number): ProductFitView {
	const p = db
		.select({ id: products.id, code: products.code, name: products.name })
		.from(products)
		.where(eq(products.id, productId))
		.get();
	if (!p)
		throw new PrintlogRequestError(404, [{ field: 'id', message: `no product #${productId}` }]);
	return { ...productFitRules(db, p), productId: p.id, name: p.name };
}

/**
 * Replace a product's stencil approvals and allowed pastes (engineers and admins; the route
 * checks the role). Approved stencils must exist (by name, any revision); duplicates collapse.
 * One transaction with the audit entry (before and after).
 * @throws PrintlogRequestError 404 unknown product; 422 unknown stencil names.
 */
export function setProductFit(
	db: Db,
	productId: number,
	input: ProductFitPayload,
	actor: Actor | null
): ProductFitView {
	const before = getProductFit(db, productId);
	const known = new Map(listStencilRefs(db).map((s) => [normaliseScannedCode(s.name), s.name]));
	const errors: FieldError[] = [];
	const approvals = new Map<string, { stencilName: string; side: BoardSide }>();
	input.approvals.forEach((a, i) => {
		const name = known.get(normaliseScannedCode(a.stencil));
		if (!name) {
			errors.push({
				field: `approvals[${i}].stencil`,
				message: unknownCode('stencil', a.stencil, [...new Set(known.values())])
			});
		} else approvals.set(`${name}|${a.side}`, { stencilName: name, side: a.side });
	});
	if (errors.length) throw new PrintlogRequestError(422, errors);
	const alloys = new Map(input.alloys.map((a) => [normaliseAlloy(a), a]));
	const powderTypes = [...new Set(input.powderTypes)];
	db.transaction((tx) => {
		tx.delete(productStencilApprovals)
			.where(eq(productStencilApprovals.productId, productId))
			.run();
		tx.delete(productPasteAllowances).where(eq(productPasteAllowances.productId, productId)).run();
		const by = actor?.kind === 'user' ? actor.id : null;
		for (const a of approvals.values()) {
			tx.insert(productStencilApprovals)
				.values({ productId, ...a, createdByUserId: by })
				.run();
		}
		for (const value of alloys.values()) {
			tx.insert(productPasteAllowances)
				.values({ productId, kind: 'alloy', value, createdByUserId: by })
				.run();
		}
		for (const type of powderTypes) {
			tx.insert(productPasteAllowances)
				.values({ productId, kind: 'powder-type', value: String(type), createdByUserId: by })
				.run();
		}
		const after = getProductFit(tx as unknown as Db, productId);
		recordAudit(tx, actor, {
			action: 'set-fit',
			entity: 'product',
			entityId: productId,
			before: fitSnapshot(before),
			after: fitSnapshot(after)
		});
	});
	return getProductFit(db, productId);
}

function fitSnapshot(view: ProductFitView): Record<string, unknown> {
	return {
		product: view.product,
		approvals: view.approvals,
		alloys: view.alloys,
		powderTypes: view.powderTypes
	};
}
