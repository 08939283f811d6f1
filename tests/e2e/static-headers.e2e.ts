import { expect, test } from '@playwright/test';
import { join } from 'node:path';
import { freePort } from '../../scripts/lib/own-server';
import { ownServersPerTest } from './own-servers';

// Static files are served by adapter-node before SvelteKit's hooks run; server.js gives them the
// same base headers as every other answer (README, Security).

type Headers = Record<string, string>;

function expectBaseHeaders(headers: Headers, what: string, hsts: boolean) {
	expect(headers['x-frame-options'], what).toBe('DENY');
	expect(headers['x-content-type-options'], what).toBe('nosniff');
	expect(headers['referrer-policy'], what).toBe('same-origin');
	if (hsts) expect(headers['strict-transport-security'], what).toBe('max-age=31536000');
	else expect(headers['strict-transport-security'], what).toBeUndefined();
}

/** A real built asset: the first /_app/immutable/ script the sign-in page loads. */
function immutableAssetIn(signinHtml: string): string {
	// Kit writes the links relative to the page (`./_app/immutable/…`).
	const link = /["']((?:\.{1,2})?\/_app\/immutable\/[^"']+\.js)["']/.exec(signinHtml)?.[1];
	expect(link, 'the sign-in page loads a built script').toBeTruthy();
	return new URL(link!, 'http://rollbead.invalid/signin').pathname;
}

test('static files carry the base security headers and keep their caching', async ({ request }) => {
	const asset = immutableAssetIn(await (await request.get('/signin')).text());
	const script = await request.get(asset);
	expect(script.status(), asset).toBe(200);
	expect(script.headers()['content-type']).toContain('javascript');
	expectBaseHeaders(script.headers(), asset, false);
	// Content-hashed files may be kept for a year: that stays as adapter-node sets it.
	expect(script.headers()['cache-control']).toBe('public,max-age=31536000,immutable');

	const favicon = await request.get('/favicon.svg');
	expect(favicon.status()).toBe(200);
	expect(favicon.headers()['content-type']).toContain('image/svg+xml');
	expectBaseHeaders(favicon.headers(), '/favicon.svg', false);
	expect(favicon.headers()['cache-control'] ?? '').not.toContain('immutable');

	// A conditional request answered 304 by the static server carries them too.
	const etag = script.headers()['etag'];
	expect(etag).toBeTruthy();
	const again = await request.get(asset, { headers: { 'if-none-match': etag } });
	expect(again.status()).toBe(304);
	expectBaseHeaders(again.headers(), `${asset} (304)`, false);
});

test.describe('with an https ORIGIN', () => {
	const own = ownServersPerTest('rollbead-hsts-');

	test('pages, API answers and static files all carry Strict-Transport-Security', async () => {
		// The proxy in front speaks https; the server itself is reached over http here.
		const server = await own.start({
			databaseFile: join(own.folder(), 'rollbead.db'),
			port: await freePort(),
			demo: false,
			env: { ORIGIN: 'https://rollbead.fenmoor.example' }
		});
		const get = async (path: string) => {
			const res = await fetch(`${server.url}${path}`, { redirect: 'manual' });
			const text = await res.text();
			return { status: res.status, headers: Object.fromEntries(res.headers), text };
		};

		const page = await get('/signin');
		expect(page.status).toBe(200);
		expectBaseHeaders(page.headers, '/signin', true);
		expect(page.headers['content-security-policy']).toContain("frame-ancestors 'none'");

		const bounced = await get('/factory');
		expect(bounced.status).toBe(303);
		expectBaseHeaders(bounced.headers, 'redirect to /signin', true);

		for (const [path, status] of [
			['/api/health', 200],
			['/api/me', 401]
		] as const) {
			const api = await get(path);
			expect(api.status, path).toBe(status);
			expectBaseHeaders(api.headers, path, true);
			expect(api.headers['cache-control'], path).toBe('no-store');
		}

		const asset = immutableAssetIn(page.text);
		const script = await get(asset);
		expect(script.status, asset).toBe(200);
		expectBaseHeaders(script.headers, asset, true);
		expect(script.headers['cache-control']).toBe('public,max-age=31536000,immutable');

		const favicon = await get('/favicon.svg');
		expect(favicon.status).toBe(200);
		expectBaseHeaders(favicon.headers, '/favicon.svg', true);
	});
});
