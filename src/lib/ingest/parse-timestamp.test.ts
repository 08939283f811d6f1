import { describe, expect, it } from 'vitest';
import { compileTimestampPattern, createTimestampParser } from './parse-timestamp';

// Expected instants are Date.UTC of the written fields minus the written/zone offset, by hand.
describe('createTimestampParser, ISO 8601', () => {
	const utc = createTimestampParser('iso', 'UTC');
	const berlin = createTimestampParser('iso', 'Europe/Berlin');
	it.each([
		['2026-03-02T08:00:00Z', Date.UTC(2026, 2, 2, 8)],
		['2026-03-02T08:00:00z', Date.UTC(2026, 2, 2, 8)],
		['2026-03-02 08:00:00Z', Date.UTC(2026, 2, 2, 8)],
		['2026-03-02T08:00Z', Date.UTC(2026, 2, 2, 8)],
		['2026-03-02T08:00:00.5Z', Date.UTC(2026, 2, 2, 8, 0, 0, 500)],
		['2026-03-02T08:00:00.1239Z', Date.UTC(2026, 2, 2, 8, 0, 0, 123)], // truncated, not rounded
		['2026-03-02T08:00:00+01:00', Date.UTC(2026, 2, 2, 7)],
		['2026-03-02T08:00:00-0530', Date.UTC(2026, 2, 2, 13, 30)],
		['2026-03-02T08:00:00+09', Date.UTC(2026, 2, 2, -1)],
		['2026-03-02T08:00:00', Date.UTC(2026, 2, 2, 8)], // no offset: profile zone (UTC)
		['  2026-03-02T08:00:00Z  ', Date.UTC(2026, 2, 2, 8)],
		['2024-02-29T00:00:00Z', Date.UTC(2024, 1, 29)], // leap day (2024 divisible by 4)
		['1970-01-01T00:00:00Z', 0],
		['2100-12-31T23:59:59Z', Date.UTC(2100, 11, 31, 23, 59, 59)],
		['2026-03-02T08:00:00 +14:00', Date.UTC(2026, 2, 1, 18)],
		['2026-03-02T08:00:00-12:00', Date.UTC(2026, 2, 2, 20)]
	])('%s', (text, expected) => {
		expect(utc(text)).toBe(expected);
	});

	it('reads a time without offset in the profile zone (CET = UTC+1 in March)', () => {
		expect(berlin('2026-03-02T08:00:00')).toBe(Date.UTC(2026, 2, 2, 7));
		expect(berlin('2026-03-02T08:00:00Z')).toBe(Date.UTC(2026, 2, 2, 8));
	});

	it.each([
		[''],
		['2026-03-02'],
		['2026-3-2T08:00:00Z'],
		['2026-02-29T08:00:00Z'], // 2026 is not a leap year
		['2026-04-31T08:00:00Z'],
		['2026-13-01T08:00:00Z'],
		['2026-03-02T24:00:00Z'],
		['2026-03-02T08:60:00Z'],
		['2026-03-02T08:00:60Z'], // leap seconds are not accepted
		['2026-03-02T08:00:00+25:00'],
		['2026-03-02T08:00:00+15:00'], // beyond UTC+14:00, the largest offset in use
		['2026-03-02T08:00:00-12:30'],
		['1969-12-31T23:59:59Z'], // before 1970: a mapping mistake, not an inspection
		['2101-01-01T00:00:00Z'],
		['0099-03-02T08:00:00Z'], // Date.UTC would read year 99 as 1999
		['\uff12\uff10\uff12\uff16-03-02T08:00:00Z'], // full-width digits
		['\u00a02026-03-02T08:00:00Z'], // no-break space is not padding
		['2026-03-02T08:00:00Z\t'],
		['2026-03-02T08:00:00\u00a0Z'],
		['2026-03-02T08:00:00 CET'],
		['yesterday'],
		['1772438400000']
	])('rejects %j', (text) => {
		expect(utc(text)).toBeNaN();
	});
});

describe('timestamp patterns', () => {
	it.each([
		['YYYY-MM-DD HH:mm:ss', '2026-03-02 08:05:09', Date.UTC(2026, 2, 2, 8, 5, 9)],
		['DD.MM.YYYY HH:mm:ss', '02.03.2026 08:05:09', Date.UTC(2026, 2, 2, 8, 5, 9)],
		['DD.MM.YYYY HH:mm:ss', '2.3.2026 8:05:09', Date.UTC(2026, 2, 2, 8, 5, 9)],
		['MM/DD/YYYY HH:mm:ss', '03/02/2026 08:05:09', Date.UTC(2026, 2, 2, 8, 5, 9)],
		['MM/DD/YYYY hh:mm:ss A', '03/02/2026 12:05:09 AM', Date.UTC(2026, 2, 2, 0, 5, 9)],
		['MM/DD/YYYY hh:mm:ss A', '03/02/2026 12:05:09 PM', Date.UTC(2026, 2, 2, 12, 5, 9)],
		['MM/DD/YYYY hh:mm:ss A', '03/02/2026 01:05:09 pm', Date.UTC(2026, 2, 2, 13, 5, 9)],
		['YYYYMMDDHHmmss', '20260302080509', Date.UTC(2026, 2, 2, 8, 5, 9)],
		['YYYY-MM-DD[T]HH:mm:ss.SSS', '2026-03-02T08:05:09.042', Date.UTC(2026, 2, 2, 8, 5, 9, 42)],
		['YYYY-MM-DD HH:mm:ss Z', '2026-03-02 08:05:09 +02:00', Date.UTC(2026, 2, 2, 6, 5, 9)],
		['YYYY/MM/DD HH:mm', '2026/03/02 08:05', Date.UTC(2026, 2, 2, 8, 5)]
	])('%s reads %s', (pattern, text, expected) => {
		expect(createTimestampParser(pattern, 'UTC')(text)).toBe(expected);
	});

	it.each([
		['DD.MM.YYYY HH:mm:ss', '2026-03-02 08:05:09'],
		['DD.MM.YYYY HH:mm:ss', '31.04.2026 08:05:09'],
		['DD.MM.YYYY HH:mm:ss', '02.03.2026 08:05:09 extra'],
		['MM/DD/YYYY hh:mm:ss A', '03/02/2026 13:05:09 PM'],
		['MM/DD/YYYY hh:mm:ss A', '03/02/2026 00:05:09 AM'],
		['YYYY-MM-DD HH:mm:ss', '26-03-02 08:05:09']
	])('%s rejects %s', (pattern, text) => {
		expect(createTimestampParser(pattern, 'UTC')(text)).toBeNaN();
	});

	it('applies the zone and DST rule to patterns (Berlin 29 Mar 2026 02:30 is in the gap → 03:30 CEST)', () => {
		const read = createTimestampParser('DD.MM.YYYY HH:mm:ss', 'Europe/Berlin');
		expect(new Date(read('29.03.2026 02:30:00')).toISOString()).toBe('2026-03-29T01:30:00.000Z');
	});

	it.each([
		['HH:mm:ss', 'lacks YYYY'],
		['YYYY-MM HH:mm', 'lacks DD'],
		['YYYY-MM-DD', 'lacks mm'],
		['YYYY-MM-DD mm', 'lacks HH or hh'],
		['YYYY-MM-DD hh:mm', 'hh (12-hour) and A (AM/PM) go together'],
		['YYYY-MM-DD [HH:mm', 'unclosed "["']
	])('pattern %j is refused: %s', (pattern, message) => {
		expect(() => compileTimestampPattern(pattern)).toThrow(message);
	});

	it('returns the parsed fields and offset', () => {
		expect(compileTimestampPattern('DD.MM.YYYY HH:mm:ss')('02.03.2026 08:05:09')).toEqual({
			local: { year: 2026, month: 3, day: 2, hour: 8, minute: 5, second: 9, millisecond: 0 },
			offsetMinutes: null
		});
	});
});
