import { describe, expect, it } from 'vitest';
import { parseDay, parseInstant, parseMinutes, parseShiftStarts } from './query-params';

describe('CFX query parameters', () => {
	it('accepts what they say and names what they refuse', () => {
		expect(parseDay('2026-12-03')).toEqual({ ok: true, value: '2026-12-03' });
		expect(parseDay('2026-02-30')).toEqual({
			ok: false,
			field: 'day',
			message: '2026-02-30 is not a calendar day (1970–2100)'
		});
		expect(parseDay(null).ok).toBe(false);
		expect(parseShiftStarts(null)).toEqual({ ok: true, value: ['06:00', '14:00', '22:00'] });
		expect(parseShiftStarts('06:00,18:00')).toEqual({ ok: true, value: ['06:00', '18:00'] });
		for (const bad of [
			'6:00',
			'06:00,06:00',
			'24:00',
			'',
			'06:00,07:00,08:00,09:00,10:00,11:00,12:00'
		]) {
			expect(parseShiftStarts(bad).ok, bad).toBe(false);
		}
		expect(parseMinutes(null, 'idleMinutes', 5, 1, 240)).toEqual({ ok: true, value: 5 });
		for (const bad of ['0', '241', '1e2', '0x10', ' 5', '-1'])
			expect(parseMinutes(bad, 'idleMinutes', 5, 1, 240).ok, bad).toBe(false);
		expect(parseInstant('2026-12-03', 'from')).toEqual({ ok: true, value: Date.UTC(2026, 11, 3) });
		expect(parseInstant('2026-12-03T08:00:00+01:00', 'from')).toEqual({
			ok: true,
			value: Date.UTC(2026, 11, 3, 7)
		});
		expect(parseInstant('2026-12-03T08:00:00', 'from').ok).toBe(false);
		expect(parseInstant('yesterday', 'to').ok).toBe(false);
	});
});
