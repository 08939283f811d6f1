import { isRedirect, type Handle } from '@sveltejs/kit';
import { baseSecurityHeaders } from './base-headers.js';

const isApi = (path: string) => path === '/api' || path.startsWith('/api/');

/**
 * Strict defaults for answers without their own policy (JSON, CSV, plain-text refusals): they
 * load nothing and may not be framed. HTML pages get kit.csp's policy (svelte.config.js).
 */
const FALLBACK_CSP =
	"default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/**
 * The headers every SvelteKit answer carries: the base ones (server.js also puts them on the
 * static files adapter-node serves before hooks run), a CSP and Cache-Control. `private` answers
 * (signed-in pages, the API, downloads) are never stored by a browser or proxy: a shared
 * shop-floor PC must not show the last person's page from its cache.
 */
export function applySecurityHeaders(
	headers: Headers,
	opts: { path: string; signedIn: boolean; origin: string | undefined }
): void {
	for (const [name, value] of baseSecurityHeaders(opts.origin)) headers.set(name, value);
	if (!headers.has('content-security-policy')) headers.set('content-security-policy', FALLBACK_CSP);
	const download = /attachment/i.test(headers.get('content-disposition') ?? '');
	if (opts.signedIn || isApi(opts.path) || download) headers.set('cache-control', 'no-store');
}

/** First in the hooks sequence, so refusals and redirects made by later handles get them too. */
export const securityHeaders: Handle = async ({ event, resolve }) => {
	let response: Response;
	try {
		response = await resolve(event);
	} catch (err) {
		// A redirect thrown by a later handle (e.g. to /signin) becomes a response here, with headers.
		if (!isRedirect(err)) throw err;
		response = new Response(null, { status: err.status, headers: { location: err.location } });
	}
	const opts = {
		path: event.url.pathname,
		signedIn: !!event.locals.actor,
		origin: process.env.ORIGIN
	};
	try {
		applySecurityHeaders(response.headers, opts);
	} catch {
		// Immutable headers (a fetched or Response.redirect answer): copy it once.
		response = new Response(response.body, response);
		applySecurityHeaders(response.headers, opts);
	}
	return response;
};
