/**
 * Work-around for a `gerber-parser` 4.2 bug: its macro expression evaluator reads a unary
 * minus such as `-$2` as `$2` (the sign is dropped), although the Gerber specification allows
 * unary + and − in macro arithmetic. Rounded-rectangle macros written with `-$2` therefore
 * collapse. The text is rewritten before parsing, on the same lines, so line numbers stay right.
 */

/** Characters after which a `-` or `+` is a sign, not a subtraction or addition. */
const SIGN_CONTEXT = new Set(['', '(', '+', '-', 'x', 'X', '/', '=', ',']);

/** A plain number parameter, which the parser already reads correctly (e.g. `-0.5`). */
const PLAIN_NUMBER = /^\s*-?[\d.]+\s*$/;

function rewriteExpression(expr: string): string {
	if (PLAIN_NUMBER.test(expr)) return expr;
	let out = '';
	let previous = '';
	for (const ch of expr) {
		if ((ch === '-' || ch === '+') && SIGN_CONTEXT.has(previous)) {
			// −a == (0−1)·a binds like a factor, so it stays right inside products and quotients.
			if (ch === '-') out += '(0-1)x';
			previous = ch === '-' ? 'x' : previous;
			continue;
		}
		out += ch;
		if (!/\s/.test(ch)) previous = ch;
	}
	return out;
}

function rewriteBlock(block: string): string {
	const body = block.trim();
	// Comment primitives (code 0) keep their text.
	if (body === '' || /^0(\s|,|$)/.test(body)) return block;
	const variable = /^(\s*\$\d+\s*=)([\s\S]*)$/.exec(block);
	if (variable) return variable[1] + rewriteExpression(variable[2]);
	return block
		.split(',')
		.map((param) => rewriteExpression(param))
		.join(',');
}

/**
 * Rewrite unary signs inside aperture macro definitions (`%AM…%`) of a Gerber file: `-e`
 * becomes `(0-1)xe` and a unary `+` is dropped; everything else, including newlines, is kept.
 * Used by the Gerber importer before handing the text to `gerber-parser`.
 * Reference: Gerber Layer Format Specification (Ucamco), "Arithmetic expressions" (unary
 * operators + and −).
 * @example rewriteMacroUnaryMinus('%AMR*1,1,$1,-$2,-$3*%') // '%AMR*1,1,$1,(0-1)x$2,(0-1)x$3*%'
 */
export function rewriteMacroUnaryMinus(text: string): string {
	return text.replace(/%AM([^%]*)%/g, (whole, inner: string) => {
		const parts = inner.split('*');
		// parts[0] is the macro name; the rest are primitive or variable blocks.
		return `%AM${[parts[0], ...parts.slice(1).map(rewriteBlock)].join('*')}%`;
	});
}
