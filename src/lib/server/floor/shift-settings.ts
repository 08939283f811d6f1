/**
 * The site's shift definition from the environment (SHIFT_STARTS, SITE_TIME_ZONE), read once.
 * The computation is the pure `$lib/floor/shifts`.
 */
import { shiftSettingsFrom, type ShiftSettings } from '$lib/floor/shifts';

let cached: ShiftSettings | null = null;

/**
 * The site's shifts: `SHIFT_STARTS` (default `06:00,14:00,22:00`) on the wall clock of
 * `SITE_TIME_ZONE` (default `UTC`).
 * @throws Error naming the setting when a value is malformed (start-up stops with it).
 */
export function siteShiftSettings(env: NodeJS.ProcessEnv = process.env): ShiftSettings {
	if (env === process.env && cached) return cached;
	const result = shiftSettingsFrom(env);
	if (!result.ok) throw new Error(result.message);
	if (env === process.env) cached = result.value;
	return result.value;
}
