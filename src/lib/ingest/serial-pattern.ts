/**
 * The board-serial pattern of a mapping profile (`serialFromFileName.pattern`): a regular
 * expression typed by a user, so it runs on RE2 (the `re2js` port), whose matching time is linear
 * in the input. JavaScript's own engine backtracks: `(a+)+$` against a long name would stall the
 * server (or the browser tab of the profile editor) for hours.
 */
import { RE2JS } from 're2js';

/** Longest serial pattern a profile may hold (characters). */
export const MAX_SERIAL_PATTERN_LENGTH = 200;

/** A compiled serial pattern, or why it cannot be used. */
export type SerialPatternCheck =
	| { ok: true; regex: RE2JS }
	| {
			ok: false;
			/** Why, worded for the person who typed it (no location prefix). */
			reason: string;
	  };

/**
 * Compile a serial pattern on RE2 and check it has exactly one capture group. RE2 refuses what
 * it cannot match in linear time: back-references (`\1`) and look-around (`(?=`, `(?!`, `(?<=`).
 * Repeat counts above 1000 are refused too.
 * @example compileSerialPattern('^(RB-\\d+)_').ok // true
 * @example compileSerialPattern('(a)\\1') // { ok: false, reason: 'serial pattern is not valid RE2 syntax: invalid escape sequence: `\\1` (...)' }
 */
export function compileSerialPattern(pattern: string): SerialPatternCheck {
	if (pattern.length === 0) return { ok: false, reason: 'serial pattern is empty' };
	if (pattern.length > MAX_SERIAL_PATTERN_LENGTH) {
		return {
			ok: false,
			reason: `serial pattern is longer than ${MAX_SERIAL_PATTERN_LENGTH} characters`
		};
	}
	let regex: RE2JS;
	try {
		regex = RE2JS.compile(pattern);
	} catch (e) {
		const detail = String((e as Error).message).replace(/^error parsing regexp: /, '');
		return {
			ok: false,
			reason: `serial pattern is not valid RE2 syntax: ${detail} (back-references and look-around are not supported)`
		};
	}
	const groups = regex.groupCount();
	if (groups !== 1) {
		return {
			ok: false,
			reason: `serial pattern must have exactly one (capture group) for the serial; it has ${groups}`
		};
	}
	return { ok: true, regex };
}

/**
 * The serial a compiled pattern takes from a text (its first match's capture group, trimmed);
 * null when it does not match or captures nothing. Linear in the text's length.
 * @example serialFromText(compiled, 'RB-17_top.csv') // 'RB-17' for ^(RB-\d+)_
 */
export function serialFromText(regex: RE2JS, text: string): string | null {
	const matcher = regex.matcher(text);
	if (!matcher.find()) return null;
	const serial = matcher.group(1)?.trim() ?? '';
	return serial === '' ? null : serial;
}
