import { describe, expect, it } from 'vitest';
import { FLOOR_DEFAULTS } from '$lib/floor/tile';
import { siteFloorSettings } from './floor-settings';

describe('siteFloorSettings', () => {
	it('reads the site thresholds from the environment it is given', () => {
		expect(siteFloorSettings({ FLOOR_TENSION_CHECK_EVERY_DAYS: '14' })).toEqual({
			...FLOOR_DEFAULTS,
			tensionCheckEveryDays: 14
		});
	});
	it('stops with the variable named when a value is malformed', () => {
		expect(() => siteFloorSettings({ FLOOR_STALL_MINUTES: '10 min' })).toThrow(
			/FLOOR_STALL_MINUTES="10 min": must be a whole number from 1 to 1440/
		);
	});
});
