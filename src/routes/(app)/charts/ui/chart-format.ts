import { RULE_DESCRIPTIONS, type RuleId } from '$lib/spc';

/**
 * Decimals that show a chart's numbers to about a hundredth of its sigma, so 1.5056 µm and
 * 50.81 % both read sensibly; 0..6.
 * @example decimalsFor(0.14) // 3
 */
export function decimalsFor(sigma: number | null | undefined): number {
	if (!sigma || !Number.isFinite(sigma) || sigma <= 0) return 2;
	return Math.min(6, Math.max(0, Math.ceil(-Math.log10(sigma)) + 2));
}

/** Rule id with its plain-language description, e.g. "we-2 · 2 of 3 points …". */
export function ruleLabel(rule: RuleId): string {
	return `${rule} · ${RULE_DESCRIPTIONS[rule]}`;
}
