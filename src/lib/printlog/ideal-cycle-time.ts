import { parseDecimal } from '../ingest/parse-decimal';

/**
 * The recipe form's ideal cycle time field (seconds per board), read as `POST /api/recipes`
 * takes it: blank is left out (the current version's value is kept), anything else must be a
 * plain decimal number (strict: `0x10`, `1e`, `12 s` and `Infinity` are refused, never guessed).
 * The range (above 0, at most 3600 s) is the recipe schema's to judge.
 * @example readIdealCycleTimeS(' 22.5 ') // { ok: true, value: 22.5 }
 * @example readIdealCycleTimeS('') // { ok: true, value: undefined }
 */
export function readIdealCycleTimeS(
	text: string
): { ok: true; value: number | undefined } | { ok: false; message: string } {
	const trimmed = text.trim();
	if (trimmed === '') return { ok: true, value: undefined };
	const value = parseDecimal(trimmed, false);
	if (Number.isNaN(value)) {
		return {
			ok: false,
			message: 'give the seconds per board as a number, like 22.5 (or leave blank to keep it)'
		};
	}
	return { ok: true, value };
}
