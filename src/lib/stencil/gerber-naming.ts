/**
 * Names for Gerber apertures. A paste layer carries no reference designators, so each aperture
 * gets a stable positional name until a centroid file assigns real ones.
 */
import type { ApertureInput } from './aperture';

/** Prefix of positional names; `@` cannot start a real refdes, so the two never clash. */
export const GERBER_REFDES_PREFIX = '@';

/**
 * Name apertures by position: sort by y, then x (both ascending, rounded to whole µm so float
 * noise does not reorder a row), ties in file order; then refdes `@0001`, `@0002`, … (at least
 * four digits, more when there are over 9999) and pad `1`. The same file always gives the
 * same names. Returns new objects in the sorted order; the input is not changed.
 * @example nameGerberApertures([{ ...a, xUm: 5, yUm: 0 }, { ...a, xUm: 1, yUm: 0 }]).map((x) => x.refdes)
 * // ['@0001', '@0002'] (the aperture at x = 1 first)
 */
export function nameGerberApertures(apertures: readonly ApertureInput[]): ApertureInput[] {
	const width = Math.max(4, String(apertures.length).length);
	return apertures
		.map((aperture, index) => ({ aperture, index }))
		.sort(
			(p, q) =>
				Math.round(p.aperture.yUm) - Math.round(q.aperture.yUm) ||
				Math.round(p.aperture.xUm) - Math.round(q.aperture.xUm) ||
				p.index - q.index
		)
		.map(({ aperture }, i) => ({
			...aperture,
			refdes: GERBER_REFDES_PREFIX + String(i + 1).padStart(width, '0'),
			pad: '1'
		}));
}
