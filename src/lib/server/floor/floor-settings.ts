/**
 * The site's tile thresholds from the environment (FLOOR_* variables), read once. The parsing is
 * the pure `$lib/floor/floor-settings`.
 */
import { floorSettingsFrom } from '$lib/floor/floor-settings';
import type { FloorSettings } from '$lib/floor/tile';

let cached: FloorSettings | null = null;

/**
 * What is due and when, as this site sets it (FLOOR_DEFAULTS for anything not set).
 * @throws Error naming the variable when a value is malformed (start-up stops with it).
 */
export function siteFloorSettings(env: NodeJS.ProcessEnv = process.env): FloorSettings {
	if (env === process.env && cached) return cached;
	const result = floorSettingsFrom(env);
	if (!result.ok) throw new Error(result.message);
	if (env === process.env) cached = result.value;
	return result.value;
}
