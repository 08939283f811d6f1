/**
 * Unit conversions used across Rollbead. Everything is stored in SI-derived base units:
 * lengths in micrometres (µm), areas in µm², volumes in µm³, force in newtons.
 * Conversions live in one place so a mil is 25.4 µm everywhere.
 */

/** Length units accepted on import. */
export type LengthUnit = 'um' | 'mm' | 'mil' | 'inch';

/** µm per unit. 1 mil = 0.001 in = 25.4 µm (exact, by the 1959 international inch). */
export const MICROMETRES_PER: Record<LengthUnit, number> = {
	um: 1,
	mm: 1000,
	mil: 25.4,
	inch: 25400
};

/** Standard gravity, m/s² (CGPM 1901, exact): converts a squeegee load in kg to newtons. */
export const STANDARD_GRAVITY = 9.80665;

/**
 * Convert a length to micrometres.
 * @example toMicrometres(5, 'mil') // 127
 */
export function toMicrometres(value: number, unit: LengthUnit): number {
	return value * MICROMETRES_PER[unit];
}

/**
 * Convert a length in micrometres to another unit.
 * @example fromMicrometres(127, 'mil') // 5
 */
export function fromMicrometres(valueUm: number, unit: LengthUnit): number {
	return valueUm / MICROMETRES_PER[unit];
}

/** Convert a volume to µm³ from a cubic length unit (e.g. mil³). */
export function toCubicMicrometres(value: number, unit: LengthUnit): number {
	return value * MICROMETRES_PER[unit] ** 3;
}

/**
 * Convert a mass-force in kilograms (as printers display squeegee pressure) to newtons.
 * @example kgToNewtons(1) // 9.80665
 */
export function kgToNewtons(kg: number): number {
	return kg * STANDARD_GRAVITY;
}

/** Convert newtons to a mass-force in kilograms. */
export function newtonsToKg(newtons: number): number {
	return newtons / STANDARD_GRAVITY;
}

/** Parse a unit name as typed by a user or written in a file header. */
export function parseLengthUnit(text: string): LengthUnit | null {
	const t = text.trim().toLowerCase().replace('µ', 'u').replace('μ', 'u');
	if (t === 'um' || t === 'micron' || t === 'microns' || t === 'micrometre' || t === 'micrometer')
		return 'um';
	if (t === 'mm' || t === 'millimetre' || t === 'millimeter') return 'mm';
	if (t === 'mil' || t === 'mils' || t === 'thou') return 'mil';
	if (t === 'in' || t === 'inch' || t === 'inches') return 'inch';
	return null;
}
