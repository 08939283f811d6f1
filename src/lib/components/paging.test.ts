import { describe, expect, it } from 'vitest';
import { pageOf } from './paging';

describe('pageOf', () => {
	const list = Array.from({ length: 125 }, (_, i) => i);
	it('first, middle and last page of 125 items by 50', () => {
		expect(pageOf(list, 0, 50)).toMatchObject({ page: 0, pages: 3, from: 1, to: 50, total: 125 });
		expect(pageOf(list, 1, 50).items[0]).toBe(50);
		expect(pageOf(list, 2, 50)).toMatchObject({ from: 101, to: 125 });
	});
	it('a page past the end shows the last; an empty list has one empty page', () => {
		expect(pageOf(list, 9, 50).page).toBe(2);
		expect(pageOf([], 0, 50)).toEqual({ items: [], page: 0, pages: 1, from: 0, to: 0, total: 0 });
	});
});
