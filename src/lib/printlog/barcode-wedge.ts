/**
 * Keyboard-wedge barcode scanners type the code as keystrokes, much faster than a person, and
 * end with Enter. The buffer below tells a scan from typing by timing: a scan is a burst of at
 * least `minLength` characters, each (and the final Enter) within `maxInterKeyMs` of the
 * previous key. A pause starts a new burst, so slow typing followed by a scan still yields the
 * scan alone. Framework-free: feed it `KeyboardEvent.key` and `event.timeStamp`.
 */

/** Options of the wedge buffer. */
export interface WedgeOptions {
	/** Longest gap between keys of one scan, ms (default 50; scanners send keys a few ms apart). */
	maxInterKeyMs?: number;
	/** Shortest code accepted as a scan (default 3). */
	minLength?: number;
	/** Keys that end a scan (default Enter; some scanners are set to send Tab). */
	terminators?: readonly string[];
}

/** A wedge buffer: feed every key; a completed scan comes back from the terminating key. */
export interface WedgeBuffer {
	/** Feed one key (`KeyboardEvent.key`) at `timeMs`: the code on a fast Enter, else null. */
	key(key: string, timeMs: number): string | null;
	/** Drop what has been collected (e.g. when the field loses focus). */
	reset(): void;
	/** The characters of the current burst, for debugging. */
	readonly pending: string;
}

/**
 * Create a wedge buffer. Keys other than single characters and terminators (Shift, Control …)
 * are ignored without breaking a burst; a time that is not finite or goes backwards breaks it.
 * @throws {RangeError} when an option is out of range.
 * @example
 * const wedge = createWedgeBuffer({ maxInterKeyMs: 50, minLength: 3 });
 * ['P', 'L', '7', 'Enter'].map((k, i) => wedge.key(k, 1000 + i * 10)) // [null, null, null, 'PL7']
 */
export function createWedgeBuffer(options: WedgeOptions = {}): WedgeBuffer {
	const maxInterKeyMs = options.maxInterKeyMs ?? 50;
	const minLength = options.minLength ?? 3;
	const terminators = options.terminators ?? ['Enter'];
	if (!Number.isFinite(maxInterKeyMs) || maxInterKeyMs <= 0) {
		throw new RangeError(
			`maxInterKeyMs: must be a number of milliseconds > 0 (got ${maxInterKeyMs})`
		);
	}
	if (!Number.isInteger(minLength) || minLength < 1) {
		throw new RangeError(`minLength: must be a whole number ≥ 1 (got ${minLength})`);
	}
	let chars: string[] = [];
	let lastMs: number | null = null;

	const isFast = (timeMs: number) =>
		lastMs !== null &&
		Number.isFinite(timeMs) &&
		timeMs >= lastMs &&
		timeMs - lastMs <= maxInterKeyMs;

	return {
		key(key: string, timeMs: number): string | null {
			if (terminators.includes(key)) {
				const scan = isFast(timeMs) && chars.length >= minLength ? chars.join('') : null;
				chars = [];
				lastMs = null;
				return scan;
			}
			if (typeof key !== 'string' || [...key].length !== 1) return null;
			if (!isFast(timeMs)) chars = [];
			chars.push(key);
			lastMs = Number.isFinite(timeMs) ? timeMs : null;
			return null;
		},
		reset() {
			chars = [];
			lastMs = null;
		},
		get pending() {
			return chars.join('');
		}
	};
}

/**
 * What a scan field holds after Enter. A scan into a field that already held a code (the scanner
 * appends its keys) keeps only what was typed since the field got focus; otherwise the field keeps
 * everything typed. Deciding by the content at focus, not by the last burst, keeps a scan whole
 * when the browser stalls mid-burst (the burst then splits in two, and the last part alone would
 * be a wrong code).
 * @example scanFieldValue('ST-AST-B', 'ST-A', 'ST-B') // 'ST-B'
 * @example scanFieldValue('st-pb100', '', 'b100') // 'st-pb100' (a burst split by a stall)
 */
export function scanFieldValue(
	value: string,
	valueAtFocus: string,
	scanned: string | null
): string {
	if (scanned === null || valueAtFocus === '') return value;
	if (value.length > valueAtFocus.length && value.startsWith(valueAtFocus))
		return value.slice(valueAtFocus.length);
	return value;
}
