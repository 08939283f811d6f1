/**
 * Triage of the warnings `gerber-parser` emits. The parser skips what it does not understand
 * and warns; for a paste layer some of those blocks are harmless (attributes, names, identity
 * transforms) and some change the image (mirroring, offsets, aperture transforms), which the
 * importer must refuse rather than silently get the geometry wrong.
 */

/** What to do with one parser warning. */
export type GerberWarningAction =
	{ kind: 'ignore' } | { kind: 'warning'; message: string } | { kind: 'error'; message: string };

const UNRECOGNIZED = /^block "(.*)" was not recognized and was ignored$/s;

/** Harmless blocks: X2 attributes, names, and image parameters left at their identity value. */
const HARMLESS_BLOCKS: readonly RegExp[] = [
	/^%T[FAD]/, // file, aperture and delete attributes (Gerber X2): metadata only
	/^%(IN|LN)/, // image / level name (deprecated): a label
	/^%IPPOS$/, // positive image polarity, the default
	/^%ASAXBY$/, // no axis swap, the default
	/^%MIA0B0$/, // no mirroring
	/^%OFA0(\.0*)?B0(\.0*)?$/, // zero offset
	/^%SFA1(\.0*)?B1(\.0*)?$/, // unit scale
	/^%IR0$/, // no image rotation
	/^G55$/, // "prepare for flash" (deprecated), no effect
	/^M01$/ // optional stop (deprecated), no effect
];

/** Blocks that would change the geometry, with the reason they are refused. */
const REFUSED_BLOCKS: readonly [RegExp, string][] = [
	[/^%IPNEG/, 'negative image polarity (%IPNEG) is not supported'],
	[/^%AS/, 'axis swap (%AS) is not supported'],
	[/^%MI/, 'image mirroring (%MI) is not supported'],
	[/^%OF/, 'image offset (%OF) is not supported'],
	[/^%SF/, 'image scaling (%SF) is not supported'],
	[/^%IR/, 'image rotation (%IR) is not supported'],
	[/^%L[MRS]/, 'aperture transformations (%LM, %LR, %LS) are not supported'],
	[/^%AB/, 'block apertures (%AB) are not supported']
];

/** Quote a block for a message, shortened so binary junk cannot flood the report. */
function quote(block: string): string {
	return JSON.stringify(block.length > 40 ? `${block.slice(0, 40)}…` : block);
}

/**
 * Decide whether a `gerber-parser` warning is ignored, passed on as a warning, or makes the
 * import fail. Used by the Gerber importer on every `warning` event.
 * Reference: Gerber Layer Format Specification (Ucamco), "Deprecated commands" and
 * "Attributes"; the warning texts are those of gerber-parser 4.2 (`lib/_parse-gerber.js`).
 * @example classifyGerberParserWarning('block "%TF.FileFunction,Paste,Top" was not recognized and was ignored')
 * // { kind: 'ignore' }
 * @example classifyGerberParserWarning('block "XYZ" was not recognized and was ignored')
 * // { kind: 'error', message: 'unsupported or unknown command "XYZ"' }
 */
export function classifyGerberParserWarning(message: string): GerberWarningAction {
	const unrecognized = UNRECOGNIZED.exec(message);
	if (unrecognized) {
		const block = unrecognized[1];
		if (HARMLESS_BLOCKS.some((re) => re.test(block))) return { kind: 'ignore' };
		const refused = REFUSED_BLOCKS.find(([re]) => re.test(block));
		if (refused) return { kind: 'error', message: `${refused[1]} (${quote(block)})` };
		return { kind: 'error', message: `unsupported or unknown command ${quote(block)}` };
	}
	const primitive = /^(.*) is an unrecognized primitive for a macro aperture$/s.exec(message);
	if (primitive) {
		// A primitive the parser could not split comes back as its evaluator's source text.
		const code = /^function/.test(primitive[1]) ? 'with an expression' : quote(primitive[1]);
		const message = `macro primitive code ${code} is not supported`;
		return { kind: 'error', message };
	}
	// The rest (deprecated forms, assumed zero suppression) are recoverable: pass them on.
	return { kind: 'warning', message };
}
