/**
 * Where to send someone after signing in: only a path on our own origin. A target must start
 * with a single `/` (not `//` or `/\`, which browsers read as another host), hold no control
 * characters (browsers drop tabs and line breaks, so `/\t/evil.example` becomes `//evil.example`)
 * and still be on `origin` once resolved against it. Anything else gives `fallback`.
 *
 * @example sameOriginPath('/factory?line=2', 'https://rollbead.example') // '/factory?line=2'
 * @example sameOriginPath('/\\evil.example', 'https://rollbead.example') // '/'
 */
export function sameOriginPath(target: unknown, origin: string, fallback = '/'): string {
	if (typeof target !== 'string' || target.length === 0 || target.length > 2048) return fallback;
	if (target[0] !== '/' || target[1] === '/' || target[1] === '\\') return fallback;
	if (/[\u0000-\u001f\u007f\\]/.test(target)) return fallback;
	let url: URL;
	try {
		url = new URL(target, origin);
	} catch {
		return fallback;
	}
	if (url.origin !== new URL(origin).origin) return fallback;
	return url.pathname + url.search + url.hash;
}

/**
 * The same for a URL Auth.js hands over, which may already be absolute on our origin: the path
 * part is checked as above and the answer is always absolute on `origin`.
 */
export function sameOriginUrl(target: unknown, origin: string): string {
	const base = new URL(origin).origin;
	let path = target;
	if (typeof target === 'string' && (target === base || target.startsWith(base + '/'))) {
		path = target.slice(base.length) || '/';
	}
	return base + sameOriginPath(path, base);
}
