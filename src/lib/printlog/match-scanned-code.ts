/**
 * Match a scanned or typed code (stencil name, paste lot number, blade code) against the known
 * candidates. Scanners may prefix an AIM symbology identifier (ISO/IEC 15424: `]` + symbology
 * letter + modifier, e.g. `]C1` for GS1-128, `]Q1` for QR; from memory) and add control
 * characters or spaces; those are removed and case is ignored before comparing.
 */

/** A candidate code with a label to show in suggestions. */
export interface CodeCandidate {
	code: string;
	label: string;
}

const AIM_PREFIX = /^\][A-Za-z][0-9A-Za-z]/;
const CONTROL_CHARS = /[\u0000-\u001f\u007f]/g;

/**
 * Normalise a code for comparison: control characters removed, trimmed, AIM symbology prefix
 * removed, upper case.
 * @example normaliseScannedCode(']C1pl-2026-0042\r') // 'PL-2026-0042'
 */
export function normaliseScannedCode(raw: string): string {
	if (typeof raw !== 'string') return '';
	return raw.replace(CONTROL_CHARS, '').trim().replace(AIM_PREFIX, '').trim().toUpperCase();
}

/** Levenshtein edit distance (insert, delete, substitute), O(|a|·|b|). */
function editDistance(a: string, b: string): number {
	let previous = Array.from({ length: b.length + 1 }, (_, j) => j);
	for (let i = 1; i <= a.length; i++) {
		const current = [i];
		for (let j = 1; j <= b.length; j++) {
			const substitution = previous[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1);
			current.push(Math.min(previous[j] + 1, current[j - 1] + 1, substitution));
		}
		previous = current;
	}
	return previous[b.length];
}

/**
 * Find the candidate whose code equals the scan (after normalising both). Without an exact
 * match, suggest up to `maxSuggestions` close candidates: codes containing the scan or
 * contained in it (3+ characters), or within 2 edits, nearest first. The first of duplicate
 * codes wins.
 * @example
 * matchScannedCode(' ]C1st-0007 ', [{ code: 'ST-0007', label: 'Stencil ST-0007' }])
 * // { match: { code: 'ST-0007', label: 'Stencil ST-0007' }, suggestions: [] }
 */
export function matchScannedCode<C extends CodeCandidate>(
	code: string,
	candidates: readonly C[],
	maxSuggestions = 5
): { match: C | null; suggestions: C[] } {
	const scanned = normaliseScannedCode(code);
	if (scanned === '') return { match: null, suggestions: [] };
	const normalised = candidates.map((candidate) => ({
		candidate,
		key: normaliseScannedCode(candidate.code)
	}));
	const exact = normalised.find((n) => n.key === scanned);
	if (exact) return { match: exact.candidate, suggestions: [] };
	const scored = normalised
		.map((n) => {
			const distance = editDistance(scanned, n.key);
			const contains =
				Math.min(scanned.length, n.key.length) >= 3 &&
				(n.key.includes(scanned) || scanned.includes(n.key));
			return { ...n, distance, close: distance <= 2 || contains };
		})
		.filter((n) => n.close && n.key !== '')
		.sort((a, b) => a.distance - b.distance || a.key.localeCompare(b.key));
	return { match: null, suggestions: scored.slice(0, maxSuggestions).map((n) => n.candidate) };
}
