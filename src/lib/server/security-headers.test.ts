import { describe, expect, it } from 'vitest';
import { baseSecurityHeaders, hstsFor } from './base-headers.js';
import { applySecurityHeaders } from './security-headers';

describe('security headers', () => {
	it('sets framing, sniffing, referrer and a strict fallback CSP on every answer', () => {
		const h = new Headers({ 'content-type': 'application/json' });
		applySecurityHeaders(h, { path: '/signin', signedIn: false, origin: 'http://localhost:3000' });
		expect(h.get('x-frame-options')).toBe('DENY');
		expect(h.get('x-content-type-options')).toBe('nosniff');
		expect(h.get('referrer-policy')).toBe('same-origin');
		expect(h.get('content-security-policy')).toContain("frame-ancestors 'none'");
		expect(h.get('cache-control')).toBeNull();
		expect(h.get('strict-transport-security')).toBeNull();
	});

	it('keeps a page CSP from kit.csp and marks private answers no-store', () => {
		const page = new Headers({ 'content-security-policy': "script-src 'self' 'nonce-x'" });
		applySecurityHeaders(page, { path: '/factory', signedIn: true, origin: undefined });
		expect(page.get('content-security-policy')).toBe("script-src 'self' 'nonce-x'");
		expect(page.get('cache-control')).toBe('no-store');

		const api = new Headers({ 'cache-control': 'max-age=600' });
		applySecurityHeaders(api, { path: '/api/health', signedIn: false, origin: undefined });
		expect(api.get('cache-control')).toBe('no-store');

		const download = new Headers({ 'content-disposition': 'attachment; filename="a.csv"' });
		applySecurityHeaders(download, {
			path: '/stencils/1/apertures.csv',
			signedIn: false,
			origin: undefined
		});
		expect(download.get('cache-control')).toBe('no-store');
	});

	it('sends HSTS only when ORIGIN is https', () => {
		expect(hstsFor('https://rollbead.fenmoor.example')).toBe('max-age=31536000');
		expect(hstsFor('HTTPS://rollbead.fenmoor.example')).toBe('max-age=31536000');
		expect(hstsFor('http://10.0.0.5:3000')).toBeNull();
		expect(hstsFor(undefined)).toBeNull();

		const page = new Headers();
		applySecurityHeaders(page, { path: '/', signedIn: true, origin: 'https://rb.example' });
		expect(page.get('strict-transport-security')).toBe('max-age=31536000');
	});

	it('gives static files (server.js) the same base headers as SvelteKit answers', () => {
		for (const origin of ['http://10.0.0.5:3000', 'https://rollbead.fenmoor.example']) {
			const page = new Headers();
			applySecurityHeaders(page, { path: '/signin', signedIn: false, origin });
			const base = new Map(baseSecurityHeaders(origin));
			expect(base.get('x-frame-options')).toBe('DENY');
			expect(base.get('x-content-type-options')).toBe('nosniff');
			expect(base.get('referrer-policy')).toBe('same-origin');
			expect(base.get('strict-transport-security') ?? null).toBe(hstsFor(origin));
			for (const [name, value] of base) expect(page.get(name), name).toBe(value);
		}
	});
});
