/**
 * Stencil foil tension readings in N/cm, as taken with a tension gauge at several points of a
 * mesh-mounted or frameless-system stencil. A low reading means the foil no longer gaskets well
 * against the board. The minimum is a setting: 35 N/cm by default (from memory / common
 * practice; use the frame supplier's figure).
 */
import type { FieldError } from './field-error';
import { describeValue } from './field-error';

/** Tension limits in N/cm. */
export interface TensionSettings {
	/** Lowest acceptable reading (default 35 N/cm, from memory / common practice). */
	minTensionNPerCm: number;
}

/** Default tension settings (see reference/printlog/defaults.md). */
export const DEFAULT_TENSION: Readonly<TensionSettings> = Object.freeze({ minTensionNPerCm: 35 });

/** Highest plausible reading, N/cm (Rollbead plausibility limit: catches N/m or typing slips). */
export const MAX_PLAUSIBLE_TENSION_N_PER_CM = 100;

/** Result of checking a set of readings. */
export interface TensionCheck {
	errors: FieldError[];
	/** Readings below the minimum, with their position in the list. */
	low: { index: number; valueNPerCm: number }[];
	minimumNPerCm: number | null;
	meanNPerCm: number | null;
	/** True when there are readings, none invalid and none low. */
	pass: boolean;
}

/**
 * Check tension readings: each a finite number > 0 and ≤ 100 N/cm; readings below the minimum
 * setting are listed as low (a reading exactly at the minimum passes).
 * @example checkTensionReadings([38, 36, 34.5, 40, 37]).low // [{ index: 2, valueNPerCm: 34.5 }]
 */
export function checkTensionReadings(
	readingsNPerCm: readonly unknown[],
	settings: TensionSettings = DEFAULT_TENSION
): TensionCheck {
	const errors: FieldError[] = [];
	const min = settings.minTensionNPerCm;
	if (!isPlausibleTension(min)) {
		errors.push({
			field: 'minTensionNPerCm',
			message: `must be > 0 and ≤ ${MAX_PLAUSIBLE_TENSION_N_PER_CM} N/cm (got ${describeValue(min)})`
		});
	}
	if (!Array.isArray(readingsNPerCm) || readingsNPerCm.length === 0) {
		errors.push({ field: 'readings', message: 'must list at least one reading in N/cm' });
		return { errors, low: [], minimumNPerCm: null, meanNPerCm: null, pass: false };
	}
	const valid: number[] = [];
	const low: { index: number; valueNPerCm: number }[] = [];
	readingsNPerCm.forEach((value, index) => {
		if (!isPlausibleTension(value)) {
			errors.push({
				field: `readings[${index}]`,
				message: `must be a tension in N/cm, > 0 and ≤ ${MAX_PLAUSIBLE_TENSION_N_PER_CM} (got ${describeValue(value)})`
			});
			return;
		}
		valid.push(value);
		if (value < min) low.push({ index, valueNPerCm: value });
	});
	const minimumNPerCm = valid.length > 0 ? Math.min(...valid) : null;
	const meanNPerCm = valid.length > 0 ? valid.reduce((a, b) => a + b, 0) / valid.length : null;
	return { errors, low, minimumNPerCm, meanNPerCm, pass: errors.length === 0 && low.length === 0 };
}

/** A finite tension > 0 and ≤ the plausibility limit (narrows the type). */
function isPlausibleTension(value: unknown): value is number {
	return (
		typeof value === 'number' &&
		Number.isFinite(value) &&
		value > 0 &&
		value <= MAX_PLAUSIBLE_TENSION_N_PER_CM
	);
}
