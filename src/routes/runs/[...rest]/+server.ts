import { error, redirect } from '@sveltejs/kit';
import { movedPageTarget } from '$lib/server/moved-pages';
import type { RequestHandler } from './$types';

/** The page moved (see MOVED_PAGES): a permanent redirect keeps old links and bookmarks working. */
export const GET: RequestHandler = ({ url }) => {
	const target = movedPageTarget(url.pathname, url.search);
	if (!target) error(404, 'Not found');
	redirect(308, target);
};
