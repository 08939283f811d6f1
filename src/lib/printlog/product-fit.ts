/**
 * Stencil, paste and product belong together. A product names the stencils approved for it (by
 * stencil name, for a side of the board) and the pastes it allows (alloys and IPC J-STD-005
 * powder types). Starting a run with a stencil not approved for the product, or a paste whose
 * alloy or powder type the product does not allow, is refused with the reason; an engineer or
 * admin may go on with a note (the caller keeps it on the run and in the audit log). A product
 * with no rule of a kind yet is not refused on it: the run is warned that it was not checked.
 */
import type { FieldError } from './field-error';
import { normaliseScannedCode } from './match-scanned-code';

export const BOARD_SIDES = ['top', 'bottom'] as const;
export type BoardSide = (typeof BOARD_SIDES)[number];

/** A stencil approved for a product, for one side of the board. */
export type StencilApproval = { stencilName: string; side: BoardSide };

/** What a product allows; empty lists mean "no rule of that kind yet". */
export type ProductFitRules = {
	product: string;
	approvals: readonly StencilApproval[];
	alloys: readonly string[];
	powderTypes: readonly number[];
};

/** Why a run is refused; `field` is the run payload field the refusal is about. */
export type ProductFitReason =
	'stencil-not-approved' | 'alloy-not-allowed' | 'powder-type-not-allowed';
export type ProductFitRefusal = {
	field: 'stencil' | 'pasteLot';
	reason: ProductFitReason;
	message: string;
};

/** The stencil and paste a run would use (the lot's alloy and powder type as received). */
export type RunMaterials = {
	stencil: string;
	paste: { lotNumber: string; alloy: string; powderType: number } | null;
};

export type ProductFitCheck = {
	refuse: ProductFitRefusal[];
	/** Kinds of rule the product does not have yet, worded as warnings. */
	unchecked: string[];
};

/**
 * Alloy names compare without case, spaces, dots, hyphens or underscores ("sac 305" is SAC305).
 * @example normaliseAlloy('Sn63-Pb37') // 'SN63PB37'
 */
export function normaliseAlloy(alloy: string): string {
	return alloy.replace(/[\s._-]+/g, '').toUpperCase();
}

function sidesText(approvals: readonly StencilApproval[], name: string): string {
	return approvals
		.filter((a) => normaliseScannedCode(a.stencilName) === name)
		.map((a) => a.side)
		.join(' and ');
}

function approvedList(approvals: readonly StencilApproval[]): string {
	const names = [...new Set(approvals.map((a) => normaliseScannedCode(a.stencilName)))];
	return names.map((n) => `${n} (${sidesText(approvals, n)})`).join(', ');
}

/**
 * Check a run's stencil and paste against the product's rules.
 * @example checkProductFit({ product: 'PB-100', approvals: [{ stencilName: 'ST-PB100', side: 'top' }], alloys: [], powderTypes: [] }, { stencil: 'ST-SH220', paste: null }).refuse[0].reason // 'stencil-not-approved'
 */
export function checkProductFit(rules: ProductFitRules, run: RunMaterials): ProductFitCheck {
	const refuse: ProductFitRefusal[] = [];
	const unchecked: string[] = [];
	const stencil = normaliseScannedCode(run.stencil);
	if (rules.approvals.length === 0) {
		unchecked.push(`no stencil is approved for ${rules.product} yet: the stencil was not checked`);
	} else if (!rules.approvals.some((a) => normaliseScannedCode(a.stencilName) === stencil)) {
		refuse.push({
			field: 'stencil',
			reason: 'stencil-not-approved',
			message: `stencil ${stencil} is not approved for ${rules.product} (approved: ${approvedList(rules.approvals)})`
		});
	}
	if (run.paste) {
		const { lotNumber, alloy, powderType } = run.paste;
		if (rules.alloys.length === 0) {
			unchecked.push(
				`${rules.product} names no allowed alloy yet: the paste alloy was not checked`
			);
		} else if (!rules.alloys.some((a) => normaliseAlloy(a) === normaliseAlloy(alloy))) {
			refuse.push({
				field: 'pasteLot',
				reason: 'alloy-not-allowed',
				message: `paste lot ${lotNumber} is ${alloy}, an alloy ${rules.product} does not allow (allowed: ${rules.alloys.join(', ')})`
			});
		}
		if (rules.powderTypes.length === 0) {
			unchecked.push(
				`${rules.product} names no allowed powder type yet: the powder type was not checked`
			);
		} else if (!rules.powderTypes.includes(powderType)) {
			refuse.push({
				field: 'pasteLot',
				reason: 'powder-type-not-allowed',
				message: `paste lot ${lotNumber} is powder type ${powderType}, which ${rules.product} does not allow (allowed: type ${rules.powderTypes.join(', ')})`
			});
		}
	}
	return { refuse, unchecked };
}

export type ProductFitOutcome = {
	errors: FieldError[];
	warnings: string[];
	/** True when refusals were set aside on an engineer's note. */
	overridden: boolean;
};

/**
 * Turn a check into field errors or, on an engineer's or admin's note, into warnings that say
 * the override was used. A note from anyone else overrides nothing (the caller refuses it).
 * @example resolveProductFit(check, { mayOverride: true, note: 'trial build, approved by J.' }).overridden // true when check refused
 */
export function resolveProductFit(
	check: ProductFitCheck,
	override: { mayOverride: boolean; note: string | null | undefined }
): ProductFitOutcome {
	const note = override.note?.trim() || '';
	const warnings = [...check.unchecked];
	if (check.refuse.length === 0) return { errors: [], warnings, overridden: false };
	if (override.mayOverride && note) {
		for (const r of check.refuse)
			warnings.push(`${r.message}; used on the engineer's override: ${note}`);
		return { errors: [], warnings, overridden: true };
	}
	const how = override.mayOverride
		? ' (give an override reason to use it anyway)'
		: ' (an engineer can override with a reason)';
	return {
		errors: check.refuse.map((r) => ({ field: r.field, message: r.message + how })),
		warnings,
		overridden: false
	};
}
