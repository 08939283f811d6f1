import { STENCIL_TECHNOLOGIES } from '$lib/stencil';
import { checkRange, QueryReader } from './query';
import type { TeFilters } from './transfer-efficiency';

/** Read `?technology=&paste=&powder=&from=&to=&floor=` strictly (400 naming each bad field). */
export function readTeFilters(url: URL): TeFilters {
	const q = new QueryReader(url, ['technology', 'paste', 'powder', 'from', 'to', 'floor']);
	const filters: TeFilters = {
		technology: q.text('technology', { oneOf: STENCIL_TECHNOLOGIES }),
		paste: q.text('paste'),
		powder: q.integer('powder', 1, 8),
		fromMs: q.instant('from'),
		toMs: q.instant('to', true),
		floor: q.decimal('floor', 0, 1.5, 0.7)
	};
	checkRange(q, filters.fromMs, filters.toMs);
	q.finish();
	return filters;
}
