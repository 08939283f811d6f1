import { describe, it, expect } from 'vitest';
import { toEpochMs } from './to-epoch-ms';

describe('toEpochMs', () => {
	// Expected values from Date.UTC (ECMAScript spec: epoch ms since 1970-01-01T00:00:00Z).
	const valid: [string | number | Date, number][] = [
		['2026-03-01', Date.UTC(2026, 2, 1)],
		['2026-03-01T08:00:00Z', Date.UTC(2026, 2, 1, 8)],
		['2026-03-01T08:00Z', Date.UTC(2026, 2, 1, 8)],
		['2026-03-01T09:00:00+01:00', Date.UTC(2026, 2, 1, 8)],
		['2026-03-01T08:00:00.250Z', Date.UTC(2026, 2, 1, 8, 0, 0, 250)],
		['2028-02-29', Date.UTC(2028, 1, 29)],
		[0, 0],
		[new Date(Date.UTC(2026, 0, 1)), Date.UTC(2026, 0, 1)]
	];
	it.each(valid)('%j', (value, expected) => expect(toEpochMs(value, 'at')).toBe(expected));

	const invalid: [unknown, string][] = [
		[
			'2026-03-01T08:00:00',
			'at: must be an ISO 8601 date or date-time with a time zone (got "2026-03-01T08:00:00")'
		],
		['2026-02-29', 'at: must be an ISO 8601 date or date-time with a time zone (got "2026-02-29")'],
		['01/03/2026', 'at: must be an ISO 8601 date or date-time with a time zone (got "01/03/2026")'],
		['', 'at: must be an ISO 8601 date or date-time with a time zone (got "")'],
		[Number.NaN, 'at: must be an ISO 8601 date or date-time with a time zone (got NaN)'],
		[
			new Date(Number.NaN),
			'at: must be an ISO 8601 date or date-time with a time zone (got Invalid Date)'
		],
		[null, 'at: must be an ISO 8601 date or date-time with a time zone (got missing)']
	];
	it.each(invalid)('%j is refused', (value, message) => {
		expect(() => toEpochMs(value as string, 'at')).toThrow(message);
	});
});
