import { apertureGeometry, areaRatio, type ApertureInput } from '../stencil';

/** An area-ratio band of an SPI characteristic's pad selection (either end open). */
export interface AreaRatioBand {
	min?: number | null;
	max?: number | null;
}

/**
 * Whether a pad's aperture lies in the band: its area ratio (area / (perimeter × thickness),
 * `$lib/stencil`) at the stencil's thickness, ends included. An aperture the stencil module cannot
 * read is left out of the band.
 * @example inAreaRatioBand({ refdes: 'C1', pad: '1', shape: 'rectangle', lengthUm: 300, widthUm: 280, xUm: 0, yUm: 0, rotationDeg: 0 }, 100, { max: 0.8 }) // true (AR 0.724)
 */
export function inAreaRatioBand(
	aperture: ApertureInput,
	thicknessUm: number,
	band: AreaRatioBand
): boolean {
	try {
		const g = apertureGeometry(aperture);
		const ar = areaRatio(g.areaUm2, g.perimeterUm, thicknessUm);
		return (band.min == null || ar >= band.min) && (band.max == null || ar <= band.max);
	} catch {
		return false;
	}
}
