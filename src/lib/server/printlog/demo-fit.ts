import type { ProductFitPayload } from '$lib/schemas/product-fit';
import type { Db } from '../db';
import { listStencilRefs, productByCode } from './lookups';
import { setProductFit } from './product-fit';

/**
 * Demo product fit (Fenmoor Works, invented): each demo stencil approved for its product's top
 * side; PB-100 lead-free only (type 4 or 5), the sensor hub and the LED driver also take the
 * leaded demo paste (the hub's runs also use the finer type 5 lot of the analysis demo). LM-48 has no stencil of its own in the demo, so its stencil is not checked (warned).
 */
const DEMO_FIT: Record<string, ProductFitPayload> = {
	'PB-100': {
		approvals: [{ stencil: 'ST-PB100', side: 'top' }],
		alloys: ['SAC305'],
		powderTypes: [4, 5]
	},
	'SH-220': {
		approvals: [{ stencil: 'ST-SH220', side: 'top' }],
		alloys: ['SAC305', 'Sn63Pb37'],
		powderTypes: [3, 4, 5]
	},
	'LM-48': { approvals: [], alloys: ['SAC305', 'Sn63Pb37'], powderTypes: [3, 4] }
};

/**
 * Seed the demo product fit; run after every demo that makes stencils. Approvals of stencils
 * the demo did not make are left out, and products that do not exist are skipped.
 */
export function seedDemoProductFit(db: Db): void {
	const names = new Set(listStencilRefs(db).map((s) => s.name));
	for (const [code, fit] of Object.entries(DEMO_FIT)) {
		const product = productByCode(db, code);
		if (!product) continue;
		const approvals = fit.approvals.filter((a) => names.has(a.stencil));
		setProductFit(db, product.id, { ...fit, approvals }, null);
	}
}
