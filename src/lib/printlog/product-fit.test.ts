import { describe, expect, it } from 'vitest';
import {
	checkProductFit,
	normaliseAlloy,
	resolveProductFit,
	type ProductFitRules
} from './product-fit';

const PB100: ProductFitRules = {
	product: 'PB-100',
	approvals: [
		{ stencilName: 'ST-PB100', side: 'top' },
		{ stencilName: 'ST-PB100-B', side: 'bottom' }
	],
	alloys: ['SAC305'],
	powderTypes: [4, 5]
};
const sacType4 = { lotNumber: 'PL-1', alloy: 'SAC305', powderType: 4 };

describe('checkProductFit', () => {
	it('an approved stencil with an allowed paste passes (codes as a scanner reads them)', () => {
		const check = checkProductFit(PB100, {
			stencil: ' st-pb100 ',
			paste: { lotNumber: 'PL-1', alloy: 'sac 305', powderType: 5 }
		});
		expect(check).toEqual({ refuse: [], unchecked: [] });
	});

	it('a stencil not approved for the product is refused on the stencil field, naming the approved ones and their sides', () => {
		const check = checkProductFit(PB100, { stencil: 'ST-SH220', paste: sacType4 });
		expect(check.refuse).toEqual([
			{
				field: 'stencil',
				reason: 'stencil-not-approved',
				message:
					'stencil ST-SH220 is not approved for PB-100 (approved: ST-PB100 (top), ST-PB100-B (bottom))'
			}
		]);
	});

	it('an alloy the product does not allow is refused on the paste lot', () => {
		const check = checkProductFit(PB100, {
			stencil: 'ST-PB100',
			paste: { lotNumber: 'PL-9', alloy: 'Sn63Pb37', powderType: 4 }
		});
		expect(check.refuse).toEqual([
			{
				field: 'pasteLot',
				reason: 'alloy-not-allowed',
				message: 'paste lot PL-9 is Sn63Pb37, an alloy PB-100 does not allow (allowed: SAC305)'
			}
		]);
	});

	it('a powder type the product does not allow is refused on the paste lot', () => {
		const check = checkProductFit(PB100, {
			stencil: 'ST-PB100',
			paste: { lotNumber: 'PL-3', alloy: 'SAC305', powderType: 3 }
		});
		expect(check.refuse.map((r) => [r.field, r.reason])).toEqual([
			['pasteLot', 'powder-type-not-allowed']
		]);
		expect(check.refuse[0].message).toBe(
			'paste lot PL-3 is powder type 3, which PB-100 does not allow (allowed: type 4, 5)'
		);
	});

	it('every reason at once: stencil, alloy and powder type', () => {
		const check = checkProductFit(PB100, {
			stencil: 'ST-OTHER',
			paste: { lotNumber: 'PL-7', alloy: 'SnPb', powderType: 3 }
		});
		expect(check.refuse.map((r) => r.reason)).toEqual([
			'stencil-not-approved',
			'alloy-not-allowed',
			'powder-type-not-allowed'
		]);
	});

	it('a product without rules is not refused but warned, kind by kind', () => {
		const bare: ProductFitRules = { product: 'NEW-1', approvals: [], alloys: [], powderTypes: [4] };
		const check = checkProductFit(bare, {
			stencil: 'ANY',
			paste: { lotNumber: 'PL-1', alloy: 'SAC305', powderType: 4 }
		});
		expect(check.refuse).toEqual([]);
		expect(check.unchecked).toEqual([
			'no stencil is approved for NEW-1 yet: the stencil was not checked',
			'NEW-1 names no allowed alloy yet: the paste alloy was not checked'
		]);
	});

	it('without a known paste lot only the stencil is checked', () => {
		expect(checkProductFit(PB100, { stencil: 'ST-PB100', paste: null })).toEqual({
			refuse: [],
			unchecked: []
		});
	});

	it('alloy names compare without case and separators only', () => {
		expect(normaliseAlloy('Sn63-Pb37')).toBe('SN63PB37');
		expect(normaliseAlloy('sac 305')).toBe(normaliseAlloy('SAC305'));
		expect(normaliseAlloy('SAC305')).not.toBe(normaliseAlloy('SAC405'));
	});
});

describe('resolveProductFit', () => {
	const refused = checkProductFit(PB100, { stencil: 'ST-SH220', paste: sacType4 });

	it('refusals become field errors; the hint says who may override', () => {
		const technician = resolveProductFit(refused, { mayOverride: false, note: 'rush' });
		expect(technician.overridden).toBe(false);
		expect(technician.errors).toEqual([
			{
				field: 'stencil',
				message: `${refused.refuse[0].message} (an engineer can override with a reason)`
			}
		]);
		const engineerNoNote = resolveProductFit(refused, { mayOverride: true, note: '   ' });
		expect(engineerNoNote.errors[0].message).toMatch(/give an override reason to use it anyway\)$/);
	});

	it("an engineer's note overrides every refusal and is named in the warnings", () => {
		const outcome = resolveProductFit(refused, {
			mayOverride: true,
			note: ' trial build for the new panel '
		});
		expect(outcome).toEqual({
			errors: [],
			warnings: [
				`${refused.refuse[0].message}; used on the engineer's override: trial build for the new panel`
			],
			overridden: true
		});
	});

	it('nothing refused: nothing overridden, the unchecked kinds stay warnings', () => {
		const check = checkProductFit(
			{ product: 'NEW-1', approvals: [], alloys: [], powderTypes: [] },
			{ stencil: 'X', paste: null }
		);
		expect(resolveProductFit(check, { mayOverride: true, note: 'n' })).toEqual({
			errors: [],
			warnings: ['no stencil is approved for NEW-1 yet: the stencil was not checked'],
			overridden: false
		});
	});
});
