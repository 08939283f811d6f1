import { FLOOR_DEFAULTS, type FloorSettings } from './tile';

/**
 * The environment variable that sets each tile threshold, with the range a value must fall in.
 * A site sets only what differs from FLOOR_DEFAULTS (for example `FLOOR_STENCIL_CLEAN_EVERY_PRINTS=500`
 * where the stencil is cleaned every shift).
 */
export const FLOOR_SETTING_ENV: Readonly<
	Record<string, { key: keyof FloorSettings; min: number; max: number }>
> = Object.freeze({
	FLOOR_STENCIL_CLEAN_EVERY_PRINTS: { key: 'stencilCleanEveryPrints', min: 1, max: 1_000_000 },
	FLOOR_STENCIL_CLEAN_EVERY_HOURS: { key: 'stencilCleanEveryHours', min: 1, max: 24 * 365 },
	FLOOR_TENSION_CHECK_EVERY_DAYS: { key: 'tensionCheckEveryDays', min: 1, max: 3650 },
	FLOOR_STALL_MINUTES: { key: 'stallMinutes', min: 1, max: 24 * 60 },
	FLOOR_PASTE_SOON_MINUTES: { key: 'pasteSoonMinutes', min: 0, max: 24 * 60 },
	FLOOR_LOT_EXPIRY_SOON_HOURS: { key: 'lotExpirySoonHours', min: 0, max: 24 * 365 },
	FLOOR_CLEAN_SOON_PRINTS: { key: 'cleanSoonPrints', min: 0, max: 1_000_000 },
	FLOOR_TENSION_SOON_DAYS: { key: 'tensionSoonDays', min: 0, max: 3650 },
	FLOOR_STENCIL_LIFE_SOON_PCT: { key: 'stencilLifeSoonPct', min: 1, max: 100 },
	FLOOR_PASS_RATE_ATTENTION_PCT: { key: 'passRateAttentionPct', min: 0, max: 100 }
});

export type FloorSettingsResult =
	{ ok: true; value: FloorSettings } | { ok: false; message: string };

/**
 * The tile thresholds with the site's overrides. Values are whole numbers written plainly
 * (`500`, not `5e2` or `500.0`) within the setting's range; anything else is refused naming the
 * variable, so a typo never silently changes what the floor is told is due.
 * @example floorSettingsFrom({ FLOOR_STALL_MINUTES: '15' }) // { ok: true, value: { …, stallMinutes: 15 } }
 */
export function floorSettingsFrom(
	env: Readonly<Record<string, string | undefined>>
): FloorSettingsResult {
	const value: FloorSettings = { ...FLOOR_DEFAULTS };
	for (const [name, { key, min, max }] of Object.entries(FLOOR_SETTING_ENV)) {
		const raw = env[name]?.trim();
		if (raw === undefined || raw === '') continue;
		const n = /^\d{1,9}$/.test(raw) ? Number(raw) : NaN;
		if (!(n >= min && n <= max)) {
			return {
				ok: false,
				message: `${name}=${JSON.stringify(env[name])}: must be a whole number from ${min} to ${max} (default ${FLOOR_DEFAULTS[key]}).`
			};
		}
		value[key] = n;
	}
	if (value.cleanSoonPrints >= value.stencilCleanEveryPrints) {
		return {
			ok: false,
			message: `FLOOR_CLEAN_SOON_PRINTS (${value.cleanSoonPrints}) must be smaller than FLOOR_STENCIL_CLEAN_EVERY_PRINTS (${value.stencilCleanEveryPrints}).`
		};
	}
	return { ok: true, value };
}
