/** One page of a list, with what the pager says about it. */
export interface Paged<T> {
	items: T[];
	/** Page shown (0-based, clamped to the pages there are). */
	page: number;
	pages: number;
	/** 1-based positions of the first and last item shown (0 and 0 for an empty list). */
	from: number;
	to: number;
	total: number;
}

/**
 * The items of one page (size ≥ 1); a page past the end shows the last one.
 * @example pageOf([1, 2, 3, 4, 5], 1, 2) // { items: [3, 4], page: 1, pages: 3, from: 3, to: 4, total: 5 }
 */
export function pageOf<T>(all: readonly T[], page: number, size: number): Paged<T> {
	const per = Math.max(1, Math.floor(size));
	const pages = Math.max(1, Math.ceil(all.length / per));
	const p = Math.min(Math.max(0, Math.floor(page) || 0), pages - 1);
	const items = all.slice(p * per, p * per + per);
	return {
		items,
		page: p,
		pages,
		from: items.length ? p * per + 1 : 0,
		to: p * per + items.length,
		total: all.length
	};
}
