/**
 * Pages that moved so that page paths match their API paths (`/print-runs` beside
 * `/api/print-runs`, `/paste-lots` beside `/api/paste-lots`). Bookmarks and printed QR codes keep
 * working: the old path answers a permanent redirect to the new one, query string kept.
 */
export const MOVED_PAGES: Readonly<Record<string, string>> = {
	'/runs': '/print-runs',
	'/paste': '/paste-lots'
};

/** Where an old page path now lives (same-origin path with its query), or undefined. */
export function movedPageTarget(pathname: string, search: string): string | undefined {
	for (const [from, to] of Object.entries(MOVED_PAGES)) {
		if (pathname === from || pathname.startsWith(from + '/'))
			return to + pathname.slice(from.length) + search;
	}
	return undefined;
}
