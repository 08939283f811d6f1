import { describe, expect, it } from 'vitest';
import { ApiError } from '../api';
import { checkRange, QueryReader } from './query';

const reader = (q: string, allowed = ['from', 'to', 'n', 'x', 'kind']) =>
	new QueryReader(new URL(`http://x/?${q}`), allowed);

function fieldsOf(r: QueryReader): string[] {
	try {
		r.finish();
	} catch (err) {
		expect(err).toBeInstanceOf(ApiError);
		return (err as ApiError).fieldProblems.map((f) => f.field);
	}
	return [];
}

describe('QueryReader', () => {
	it('reads dates as UTC days, a bare `to` date as the end of that day, and zoned date-times', () => {
		const r = reader('from=2026-03-01&to=2026-03-01&x=2026-03-01T06:30:00%2B01:00');
		expect(r.instant('from')).toBe(Date.UTC(2026, 2, 1));
		expect(r.instant('to', true)).toBe(Date.UTC(2026, 2, 2));
		expect(r.instant('x')).toBe(Date.UTC(2026, 2, 1, 5, 30));
		expect(fieldsOf(r)).toEqual([]);
	});
	it('refuses impossible dates, zone-less date-times and loose numbers, naming each field', () => {
		const r = reader('from=2026-02-30&to=2026-03-01T06:00&n=1e3&x=0x10&kind=z');
		r.instant('from');
		r.instant('to');
		r.decimal('n', 0, 10_000, 1);
		r.decimal('x', 0, 100, 1);
		r.text('kind', { oneOf: ['a', 'b'] });
		expect(fieldsOf(r)).toEqual(['from', 'to', 'n', 'x', 'kind']);
	});
	it('refuses unknown and repeated parameters, over-long text and a reversed range', () => {
		const r = reader(`n=1&n=2&colour=red&kind=${'k'.repeat(101)}`);
		r.text('kind');
		const from = Date.UTC(2026, 2, 2);
		checkRange(r, from, from - 1);
		expect(fieldsOf(r).sort()).toEqual(['colour', 'kind', 'n', 'to']);
	});
	it('keeps the default for an absent or blank value and accepts an integer in range only', () => {
		const r = reader('n=&x=7');
		expect(r.decimal('n', 0, 1, 0.7)).toBe(0.7);
		expect(r.integer('x', 1, 8)).toBe(7);
		expect(r.integer('kind', 1, 8)).toBeNull();
		const bad = reader('x=9');
		bad.integer('x', 1, 8);
		expect(fieldsOf(bad)).toEqual(['x']);
	});
});
