// Plain JavaScript (types in JSDoc) so that server.js, which node runs without a build step, and
// security-headers.ts share one definition of the headers every answer carries.

/**
 * HSTS only when Rollbead is reached over https (ORIGIN), never on a plain-http floor network.
 * @param {string | undefined} origin
 * @returns {string | null}
 */
export function hstsFor(origin) {
	return origin?.trim().toLowerCase().startsWith('https://') ? 'max-age=31536000' : null;
}

/**
 * The headers every answer carries, whatever it is: a page, an API answer, an error or a static
 * file. No framing, no content sniffing, no full URLs in Referer to other sites; HSTS with https.
 * @param {string | undefined} origin ORIGIN, for HSTS
 * @returns {[name: string, value: string][]}
 */
export function baseSecurityHeaders(origin) {
	/** @type {[string, string][]} */
	const headers = [
		['x-frame-options', 'DENY'],
		['x-content-type-options', 'nosniff'],
		['referrer-policy', 'same-origin']
	];
	const hsts = hstsFor(origin);
	if (hsts) headers.push(['strict-transport-security', hsts]);
	return headers;
}
