/**
 * Under-stencil wipe mode as a set of steps. A printer's cleaning cycle combines a dry wipe,
 * a wet (solvent) wipe and a vacuum pass; recipes and runs name the combination as text
 * ('wet-vacuum-dry'). Two spellings of the same set must compare equal, so each mode has one
 * canonical string: the steps in the order a cycle usually runs them, wet → vacuum → dry
 * (solvent loosens paste, vacuum pulls it out of the apertures, a dry pass takes the solvent off;
 * common practice).
 */
import type { FieldError } from './field-error';
import { describeValue } from './field-error';

/** The wipe steps in canonical order. */
export const WIPE_STEPS = ['wet', 'vacuum', 'dry'] as const;

/** One wipe step. */
export type WipeStep = (typeof WIPE_STEPS)[number];

/** Result of parsing a wipe mode: the canonical steps and string, or an error. */
export type WipeModeParse =
	{ ok: true; steps: WipeStep[]; canonical: string } | { ok: false; error: FieldError };

/**
 * Parse a wipe mode typed or stored in any order and separator ('dry+wet', 'Vacuum, wet',
 * 'wet-vacuum-dry'); duplicates collapse. Returns the canonical form or a field error.
 * @example parseWipeMode('dry + WET') // { ok: true, steps: ['wet', 'dry'], canonical: 'wet-dry' }
 */
export function parseWipeMode(text: unknown, field = 'wipeMode'): WipeModeParse {
	if (typeof text !== 'string' || text.trim() === '') {
		const message = `must name at least one of wet, vacuum, dry (got ${describeValue(text)})`;
		return { ok: false, error: { field, message } };
	}
	const parts = text
		.trim()
		.toLowerCase()
		.split(/[\s,+/&-]+/)
		.filter((part) => part !== '');
	const unknown = parts.filter((part) => !(WIPE_STEPS as readonly string[]).includes(part));
	if (unknown.length > 0 || parts.length === 0) {
		const listed = unknown.map((u) => `'${u}'`).join(', ') || "''";
		const message = `unknown wipe step ${listed} in ${JSON.stringify(text)}: use wet, vacuum, dry, e.g. 'wet-vacuum-dry'`;
		return { ok: false, error: { field, message } };
	}
	const steps = WIPE_STEPS.filter((step) => parts.includes(step));
	return { ok: true, steps, canonical: steps.join('-') };
}

/**
 * Canonical string for a set of wipe steps.
 * @example wipeModeString(['dry', 'wet']) // 'wet-dry'
 */
export function wipeModeString(steps: readonly WipeStep[]): string {
	return WIPE_STEPS.filter((step) => steps.includes(step)).join('-');
}

/**
 * All seven valid wipe modes in canonical form (every non-empty subset of the steps), for a
 * select box.
 * @example allWipeModes()[0] // 'wet'
 */
export function allWipeModes(): string[] {
	const modes: string[] = [];
	for (let mask = 1; mask < 1 << WIPE_STEPS.length; mask++) {
		modes.push(wipeModeString(WIPE_STEPS.filter((_, i) => mask & (1 << i))));
	}
	return modes;
}
