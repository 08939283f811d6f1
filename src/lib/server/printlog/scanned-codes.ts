import { matchScannedCode } from '$lib/printlog';

/** "did you mean …" for an unknown scanned code. */
export function unknownCode(what: string, code: string, candidates: string[]): string {
	const near = matchScannedCode(
		code,
		candidates.map((c) => ({ code: c, label: c }))
	).suggestions.map((s) => s.code);
	const hint = near.length ? `; did you mean ${near.join(', ')}?` : '';
	return `no ${what} "${code}" is known${hint}`;
}
