/**
 * How deeply a JSON text nests, found without parsing it. V8's `JSON.parse` copes with any depth,
 * but the code after it (validation, `JSON.stringify` for the audit log, structured clone)
 * recurses and overflows the stack on a body like `[[[[…]]]]`, so bodies are refused before that.
 */

/** The deepest nesting Rollbead accepts in a JSON body; real bodies stay below 10. */
export const MAX_JSON_DEPTH = 64;

/**
 * Where a JSON text first nests deeper than `limit`, or null when it never does. Brackets
 * inside strings (with their escapes) do not count. Linear in the text's length.
 * @example jsonTooDeep('[[1]]', 1) // { depth: 2, at: 2 }
 */
export function jsonTooDeep(
	text: string,
	limit: number = MAX_JSON_DEPTH
): { depth: number; at: number } | null {
	let depth = 0;
	let inString = false;
	for (let i = 0; i < text.length; i++) {
		const c = text.charCodeAt(i);
		if (inString) {
			if (c === 0x5c /* \ */) i++;
			else if (c === 0x22 /* " */) inString = false;
		} else if (c === 0x22) {
			inString = true;
		} else if (c === 0x5b /* [ */ || c === 0x7b /* { */) {
			depth++;
			if (depth > limit) return { depth, at: i + 1 };
		} else if (c === 0x5d /* ] */ || c === 0x7d /* } */) {
			depth--;
		}
	}
	return null;
}
