import { describe, expect, it } from 'vitest';
import {
	DEFAULT_SHIFT_SETTINGS,
	parseShiftStartList,
	shiftOf,
	shiftsBetween,
	shiftsOfDay,
	shiftSettingsFrom,
	type ShiftSettings
} from './shifts';

// Check values: reference/floor/shifts-dst.md (EU Directive 2000/84/EC, US Energy Policy Act 2005).
const BERLIN: ShiftSettings = { starts: ['06:00', '14:00', '22:00'], timeZone: 'Europe/Berlin' };
const NEW_YORK: ShiftSettings = { starts: ['07:00', '19:00'], timeZone: 'America/New_York' };
const iso = (ms: number) => new Date(ms).toISOString().replace('.000', '');
const span = (s: { startMs: number; endMs: number }) => [iso(s.startMs), iso(s.endMs)];
const HOUR = 3_600_000;

describe('shiftOf', () => {
	it('defaults to 06:00, 14:00, 22:00 UTC; the night shift belongs to the day it starts', () => {
		const s = shiftOf(new Date('2026-12-04T03:00:00Z'), DEFAULT_SHIFT_SETTINGS);
		expect(s).toMatchObject({
			day: '2026-12-03',
			start: '22:00',
			index: 2,
			key: '2026-12-03 22:00'
		});
		expect(span(s)).toEqual(['2026-12-03T22:00:00Z', '2026-12-04T06:00:00Z']);
	});

	it('starts inclusive, ends exclusive', () => {
		expect(shiftOf(Date.parse('2026-12-03T14:00:00Z'), DEFAULT_SHIFT_SETTINGS).start).toBe('14:00');
		expect(shiftOf(Date.parse('2026-12-03T13:59:59.999Z'), DEFAULT_SHIFT_SETTINGS).start).toBe(
			'06:00'
		);
	});

	it('reads the wall clock of the site time zone (Europe/Berlin in winter, UTC+1)', () => {
		const s = shiftOf(new Date('2026-12-03T05:30:00Z'), BERLIN);
		expect(s.key).toBe('2026-12-03 06:00');
		expect(span(s)).toEqual(['2026-12-03T05:00:00Z', '2026-12-03T13:00:00Z']);
		// 04:59 UTC is 05:59 local: still the night shift of the 2nd.
		expect(shiftOf(new Date('2026-12-03T04:59:00Z'), BERLIN).key).toBe('2026-12-02 22:00');
	});

	it('gives the night shift 7 h when the clocks go forward and 9 h when they go back', () => {
		const spring = shiftOf(new Date('2026-03-29T02:00:00Z'), BERLIN);
		expect(spring.key).toBe('2026-03-28 22:00');
		expect(span(spring)).toEqual(['2026-03-28T21:00:00Z', '2026-03-29T04:00:00Z']);
		expect(spring.endMs - spring.startMs).toBe(7 * HOUR);
		const morning = shiftOf(new Date('2026-03-29T04:00:00Z'), BERLIN);
		expect(span(morning)).toEqual(['2026-03-29T04:00:00Z', '2026-03-29T12:00:00Z']);

		const autumn = shiftOf(new Date('2026-10-25T01:30:00Z'), BERLIN);
		expect(autumn.key).toBe('2026-10-24 22:00');
		expect(span(autumn)).toEqual(['2026-10-24T20:00:00Z', '2026-10-25T05:00:00Z']);
		expect(autumn.endMs - autumn.startMs).toBe(9 * HOUR);
	});

	it('follows the US rule in America/New_York (11 h and 13 h night shifts)', () => {
		expect(span(shiftOf(new Date('2026-03-08T06:00:00Z'), NEW_YORK))).toEqual([
			'2026-03-08T00:00:00Z',
			'2026-03-08T11:00:00Z'
		]);
		expect(span(shiftOf(new Date('2026-11-01T06:00:00Z'), NEW_YORK))).toEqual([
			'2026-10-31T23:00:00Z',
			'2026-11-01T12:00:00Z'
		]);
	});

	it('starts a shift placed in the spring-forward gap when the clock resumes', () => {
		const settings = { starts: ['02:30', '14:00'], timeZone: 'Europe/Berlin' };
		const [early] = shiftsOfDay('2026-03-29', settings);
		expect(iso(early.startMs)).toBe('2026-03-29T01:30:00Z');
		expect(shiftOf(new Date('2026-03-29T01:29:00Z'), settings).key).toBe('2026-03-28 14:00');
		expect(shiftOf(new Date('2026-03-29T01:30:00Z'), settings).key).toBe('2026-03-29 02:30');
	});

	it('places every instant of a year in exactly one shift, shifts tiling time without gaps', () => {
		const from = Date.parse('2026-01-01T00:00:00Z');
		const to = Date.parse('2027-01-01T00:00:00Z');
		const shifts = shiftsBetween(from, to, BERLIN);
		for (let i = 1; i < shifts.length; i++) expect(shifts[i].startMs).toBe(shifts[i - 1].endMs);
		expect(shifts[0].startMs).toBeLessThanOrEqual(from);
		expect(shifts.at(-1)!.endMs).toBeGreaterThanOrEqual(to);
		// 365 days × 3 shifts, plus the night shift of 31 December 2025 reaching into the year.
		expect(shifts.length).toBe(365 * 3 + 1);
		for (let t = from; t < to; t += 7 * HOUR + 13 * 60_000) {
			const s = shiftOf(t, BERLIN);
			expect(t >= s.startMs && t < s.endMs).toBe(true);
		}
	});
});

describe('shift settings', () => {
	it('reads SHIFT_STARTS and SITE_TIME_ZONE, defaults when unset', () => {
		expect(shiftSettingsFrom({})).toEqual({
			ok: true,
			value: { starts: ['06:00', '14:00', '22:00'], timeZone: 'UTC' }
		});
		expect(
			shiftSettingsFrom({ SHIFT_STARTS: '18:00, 06:00', SITE_TIME_ZONE: 'Europe/Lisbon' })
		).toEqual({ ok: true, value: { starts: ['06:00', '18:00'], timeZone: 'Europe/Lisbon' } });
	});

	it('refuses malformed values, naming the setting', () => {
		for (const bad of ['6:00', '06:00,06:00', '24:00', '06:00;14:00', '', '1,2,3,4,5,6,7']) {
			expect(parseShiftStartList(bad).ok).toBe(false);
		}
		const zone = shiftSettingsFrom({ SITE_TIME_ZONE: 'Mars/Olympus' });
		expect(zone.ok).toBe(false);
		expect(!zone.ok && zone.message).toMatch(/^SITE_TIME_ZONE/);
		const starts = shiftSettingsFrom({ SHIFT_STARTS: '06:00,25:00' });
		expect(!starts.ok && starts.message).toMatch(/^SHIFT_STARTS/);
	});
});
