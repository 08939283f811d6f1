import { describe, it, expect } from 'vitest';
import { findOverlappingOpenRun, validateRunTimes } from './run-times';
import { formatFieldError } from './field-error';

describe('validateRunTimes', () => {
	const cases: [string, { startedAt: string | number; endedAt?: string | null }, string[]][] = [
		['open run', { startedAt: '2026-03-02T08:00:00Z' }, []],
		['open run, null end', { startedAt: '2026-03-02T08:00:00Z', endedAt: null }, []],
		['end after start', { startedAt: '2026-03-02T08:00:00Z', endedAt: '2026-03-02T09:30:00Z' }, []],
		[
			'end equal to start',
			{ startedAt: '2026-03-02T08:00:00Z', endedAt: '2026-03-02T08:00:00Z' },
			[]
		],
		[
			'end 1 ms before start',
			{ startedAt: '2026-03-02T08:00:00Z', endedAt: '2026-03-02T07:59:59.999Z' },
			['endedAt: must not be before startedAt (2026-03-02T08:00:00.000Z)']
		],
		[
			'same instant, other zones',
			{ startedAt: '2026-03-02T09:00:00+01:00', endedAt: '2026-03-02T08:00:00Z' },
			[]
		],
		[
			'end before start across zones',
			{ startedAt: '2026-03-02T09:00:00+01:00', endedAt: '2026-03-02T07:30:00Z' },
			['endedAt: must not be before startedAt (2026-03-02T08:00:00.000Z)']
		],
		[
			'unreadable start',
			{ startedAt: 'this morning' },
			['startedAt: must be an ISO 8601 date or date-time with a time zone (got "this morning")']
		],
		[
			'NaN start',
			{ startedAt: Number.NaN },
			['startedAt: must be an ISO 8601 date or date-time with a time zone (got NaN)']
		]
	];
	it.each(cases)('%s', (_name, run, expected) => {
		expect(validateRunTimes(run).map(formatFieldError)).toEqual(expected);
	});
});

describe('findOverlappingOpenRun', () => {
	const runs = Object.freeze([
		{
			id: 1,
			line: 'L1',
			product: 'BRD-100',
			startedAt: '2026-03-02T06:00:00Z',
			endedAt: '2026-03-02T07:00:00Z'
		},
		{ id: 2, line: 'L1', product: 'BRD-200', startedAt: '2026-03-02T07:10:00Z', endedAt: null },
		{ id: 3, line: 'L2', startedAt: '2026-03-02T07:20:00Z' }
	]);
	const cases: [string, string, number | undefined, number | null][] = [
		['open run on L1', 'L1', undefined, 2],
		['line code trimmed, any case', ' l1 ', undefined, 2],
		['open run on L2 without end field', 'L2', undefined, 3],
		['editing the open run itself', 'L1', 2, null],
		['no runs on L3', 'L3', undefined, null]
	];
	it.each(cases)('%s', (_name, line, excludeId, expectedId) => {
		expect(findOverlappingOpenRun(runs, line, excludeId)?.run.id ?? null).toBe(expectedId);
	});
	it('names the open run in the message', () => {
		expect(findOverlappingOpenRun(runs, 'L1')?.message).toBe(
			'line L1 already has an open run: run 2 (BRD-200), started 2026-03-02T07:10:00.000Z; close it first'
		);
	});
	it('handles an empty list', () => {
		expect(findOverlappingOpenRun([], 'L1')).toBeNull();
	});
});
