import { describe, expect, it } from 'vitest';
import dst from '../../../reference/ingest/dst-transitions.json';
import {
	isValidTimeZone,
	timeZoneOffsetMs,
	zonedTimeToUtc,
	type Disambiguation,
	type LocalDateTime
} from './zoned-time-to-utc';

function local(text: string): LocalDateTime {
	const [date, time] = text.split(' ');
	const [year, month, day] = date.split('-').map(Number);
	const [hour, minute, second] = time.split(':').map(Number);
	return { year, month, day, hour, minute, second, millisecond: 0 };
}

describe('zonedTimeToUtc around DST changes (reference/ingest/dst-transitions.json)', () => {
	// Expected instants come from the EU directive / US statute rules, worked by hand.
	for (const c of dst.cases) {
		for (const mode of ['compatible', 'earlier', 'later'] as const) {
			it(`${c.zone} ${c.local} (${c.kind}), ${mode}`, () => {
				const ms = zonedTimeToUtc(local(c.local), c.zone, mode as Disambiguation);
				expect(new Date(ms).toISOString()).toBe(c[mode]);
			});
		}
	}

	it.each(dst.cases.filter((c) => c.kind.startsWith('gap') || c.kind.startsWith('overlap')))(
		'reject mode throws for $zone $local ($kind)',
		(c) => {
			expect(() => zonedTimeToUtc(local(c.local), c.zone, 'reject')).toThrow(
				c.kind.startsWith('gap') ? /does not exist/ : /occurs twice/
			);
		}
	);

	it('keeps milliseconds', () => {
		const ms = zonedTimeToUtc(
			{ ...local('2026-07-01 12:00:00'), millisecond: 250 },
			'Europe/Berlin'
		);
		expect(new Date(ms).toISOString()).toBe('2026-07-01T10:00:00.250Z');
	});

	it('treats UTC without Intl', () => {
		expect(zonedTimeToUtc(local('2026-03-29 02:30:00'), 'UTC')).toBe(Date.UTC(2026, 2, 29, 2, 30));
	});

	it('rejects an unknown zone', () => {
		expect(() => zonedTimeToUtc(local('2026-01-01 00:00:00'), 'Mars/Olympus')).toThrow(
			'unknown time zone "Mars/Olympus"'
		);
	});
});

describe('timeZoneOffsetMs', () => {
	// CET = UTC+1, EST = UTC−5, IST (India) = UTC+5:30 with no DST (from memory, long-standing).
	it.each([
		['Europe/Berlin', Date.UTC(2026, 0, 15, 12), 3_600_000],
		['Europe/Berlin', Date.UTC(2026, 6, 1, 12), 7_200_000],
		['America/New_York', Date.UTC(2026, 0, 15, 12), -18_000_000],
		['Asia/Kolkata', Date.UTC(2026, 6, 1, 12), 19_800_000],
		['UTC', Date.UTC(2026, 6, 1, 12), 0]
	])('%s at %i → %i', (zone, at, offset) => {
		expect(timeZoneOffsetMs(zone, at)).toBe(offset);
	});
});

describe('isValidTimeZone', () => {
	it.each([
		['Europe/Berlin', true],
		['America/New_York', true],
		['UTC', true],
		['Mars/Olympus', false],
		['', false]
	])('%s → %s', (zone, valid) => {
		expect(isValidTimeZone(zone)).toBe(valid);
	});
});
