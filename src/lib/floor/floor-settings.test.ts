import { describe, expect, it } from 'vitest';
import { floorSettingsFrom, FLOOR_SETTING_ENV } from './floor-settings';
import { FLOOR_DEFAULTS } from './tile';

describe('floorSettingsFrom', () => {
	it('keeps the defaults when nothing is set', () => {
		expect(floorSettingsFrom({})).toEqual({ ok: true, value: FLOOR_DEFAULTS });
	});
	it('takes a site value for each threshold it sets', () => {
		const result = floorSettingsFrom({
			FLOOR_STENCIL_CLEAN_EVERY_PRINTS: '500',
			FLOOR_STALL_MINUTES: ' 15 ',
			FLOOR_PASS_RATE_ATTENTION_PCT: '95'
		});
		expect(result).toEqual({
			ok: true,
			value: {
				...FLOOR_DEFAULTS,
				stencilCleanEveryPrints: 500,
				stallMinutes: 15,
				passRateAttentionPct: 95
			}
		});
	});
	it('names the variable of a value that is not a plain whole number in range', () => {
		for (const raw of ['5e2', '500.0', '-1', 'ten', '0x10', '1000001']) {
			const result = floorSettingsFrom({ FLOOR_STENCIL_CLEAN_EVERY_PRINTS: raw });
			expect(result.ok, raw).toBe(false);
			if (!result.ok) expect(result.message).toContain('FLOOR_STENCIL_CLEAN_EVERY_PRINTS');
		}
		const pct = floorSettingsFrom({ FLOOR_STENCIL_LIFE_SOON_PCT: '101' });
		expect(pct.ok).toBe(false);
	});
	it('refuses a warning margin as large as the interval it warns about', () => {
		const result = floorSettingsFrom({
			FLOOR_STENCIL_CLEAN_EVERY_PRINTS: '200',
			FLOOR_CLEAN_SOON_PRINTS: '200'
		});
		expect(result.ok).toBe(false);
	});
	it('has a variable for every threshold of the tile', () => {
		const keys = Object.values(FLOOR_SETTING_ENV).map((s) => s.key);
		expect(new Set(keys)).toEqual(new Set(Object.keys(FLOOR_DEFAULTS)));
	});
});
