/**
 * The board serial a run records: the serial of the first board printed, read from the board's
 * label with a keyboard-wedge scanner. Unlike stencil or lot codes, a serial is not chosen from a
 * list: it is kept as read (case preserved, since SPI exports quote it exactly) after removing
 * what the scanner adds around it (control characters, an AIM symbology prefix such as `]C1`,
 * surrounding spaces). The limit of 100 characters matches the SPI `board_serial` column, so a
 * logged serial can be found again among inspected boards.
 */
import { describeValue, type FieldError } from './field-error';

/** Longest board serial, characters (the SPI canonical layout's `board_serial` limit). */
export const MAX_BOARD_SERIAL_LENGTH = 100;

const AIM_PREFIX = /^\][A-Za-z][0-9A-Za-z]/;
// Scanners may send CR, LF, Tab or a GS (group separator, U+001D) around or inside the data.
const EDGE_CONTROLS = /^[\u0000-\u001f\u007f\s]+|[\u0000-\u001f\u007f\s]+$/g;
/** Printable ASCII: space (U+0020) to tilde (U+007E). */
const PRINTABLE_ASCII = /^[\u0020-\u007e]$/;

/**
 * The serial as a scanner delivered it, cleaned: control characters and spaces at either end
 * removed, then an AIM symbology prefix, then surrounding spaces again. Case is kept.
 * @example normaliseBoardSerial(']C1FW-PB100-000123\r') // 'FW-PB100-000123'
 */
export function normaliseBoardSerial(raw: string): string {
	if (typeof raw !== 'string') return '';
	return raw.replace(EDGE_CONTROLS, '').replace(AIM_PREFIX, '').trim();
}

/**
 * What is wrong with a (normalised) board serial, or null when it is acceptable: not blank, at
 * most 100 characters, printable ASCII only (U+0020–U+007E; a control character or a character
 * outside ASCII is named with its position, counted from 1).
 * @example boardSerialProblem('FW\u0007123') // 'must contain only printable characters: U+0007 at position 3 is not'
 */
export function boardSerialProblem(serial: string): string | null {
	if (typeof serial !== 'string') return `must be text (got ${describeValue(serial)})`;
	if (serial.trim() === '') return 'must not be blank';
	const chars = [...serial];
	if (chars.length > MAX_BOARD_SERIAL_LENGTH) {
		return `must be at most ${MAX_BOARD_SERIAL_LENGTH} characters (got ${chars.length})`;
	}
	const bad = chars.findIndex((c) => !PRINTABLE_ASCII.test(c));
	if (bad >= 0) {
		const code = chars[bad].codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0');
		return `must contain only printable characters: U+${code} at position ${bad + 1} is not`;
	}
	return null;
}

/**
 * Clean and check an optional board serial from a form or API body. Blank means "not given"
 * (`value` null); otherwise the cleaned serial, or a field error naming `field`.
 * @example parseBoardSerial(' ]C1FW-1 ') // { value: 'FW-1', error: null }
 */
export function parseBoardSerial(
	raw: string | null | undefined,
	field = 'boardSerial'
): { value: string | null; error: FieldError | null } {
	if (raw === null || raw === undefined) return { value: null, error: null };
	const value = normaliseBoardSerial(raw);
	if (value === '') return { value: null, error: null };
	const problem = boardSerialProblem(value);
	return problem ? { value: null, error: { field, message: problem } } : { value, error: null };
}
