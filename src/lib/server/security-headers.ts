import { isRedirect, type Handle } from '@sveltejs/kit';

const isApi = (path: string) => path === '/api' || path.startsWith('/api/');

/**
 * Strict defaults for answers without their own policy (JSON, CSV, plain-text refusals): they
 * load nothing and may not be framed. HTML pages get kit.csp's policy (svelte.config.js).
 */
const FALLBACK_CSP =
	"default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'";

/** HSTS only when Rollbead is reached over https (ORIGIN), never on a plain-http floor network. */
export function hstsFor(origin: string | undefined): string | null {
	return origin?.trim().toLowerCase().startsWith('https://') ? 'max-age=31536000' : null;
}

/**
 * The headers every answer carries. `private` answers (signed-in pages, the API, downloads) are
 * never stored by a browser or proxy: a shared shop-floor PC must not show the last person's page
 * from its cache.
 */
export function applySecurityHeaders(
	headers: Headers,
	opts: { path: string; signedIn: boolean; origin: string | undefined }
): void {
	headers.set('x-frame-options', 'DENY');
	headers.set('x-content-type-options', 'nosniff');
	headers.set('referrer-policy', 'same-origin');
	if (!headers.has('content-security-policy')) headers.set('content-security-policy', FALLBACK_CSP);
	const download = /attachment/i.test(headers.get('content-disposition') ?? '');
	if (opts.signedIn || isApi(opts.path) || download) headers.set('cache-control', 'no-store');
	const hsts = hstsFor(opts.origin);
	if (hsts) headers.set('strict-transport-security', hsts);
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
