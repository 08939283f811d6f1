import { expect, test, type APIResponse, type Page } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

type Headers = Record<string, string>;

/** What every answer carries, whatever it is. */
function expectBaseHeaders(headers: Headers, what: string) {
	expect(headers['x-frame-options'], what).toBe('DENY');
	expect(headers['x-content-type-options'], what).toBe('nosniff');
	expect(headers['referrer-policy'], what).toBe('same-origin');
	const csp = headers['content-security-policy'] ?? '';
	expect(csp, what).toContain("frame-ancestors 'none'");
	// e2e runs over plain http: no HSTS (it is sent only when ORIGIN is https; unit-tested).
	expect(headers['strict-transport-security'], what).toBeUndefined();
}

/** A page policy: scripts from us or with this answer's nonce only, never inline or eval. */
function expectPageCsp(headers: Headers, what: string) {
	const csp = headers['content-security-policy'] ?? '';
	const scriptSrc = /script-src ([^;]*)/.exec(csp)?.[1] ?? '';
	expect(scriptSrc, what).toContain("'self'");
	expect(scriptSrc, what).toMatch(/'nonce-[A-Za-z0-9+/=]+'/);
	expect(scriptSrc, what).not.toContain('unsafe-inline');
	expect(scriptSrc, what).not.toContain('unsafe-eval');
	expect(csp, what).toContain("object-src 'none'");
	expect(csp, what).toContain("base-uri 'self'");
}

const headersOf = (response: APIResponse | null) => {
	expect(response).not.toBeNull();
	return response!.headers();
};

test.describe('security headers', () => {
	test('pages: signed out, signed in, redirects and error pages', async ({ page, request }) => {
		const signin = headersOf(await request.get('/signin'));
		expectBaseHeaders(signin, '/signin');
		expectPageCsp(signin, '/signin');

		const bounced = await request.get('/factory', { maxRedirects: 0 });
		expect(bounced.status()).toBe(303);
		expectBaseHeaders(bounced.headers(), 'redirect to /signin');

		await signInAs(page, 'engineer');
		for (const path of ['/', '/factory', '/print-runs', '/stencils']) {
			const response = await page.goto(path);
			expect(response?.status(), path).toBe(200);
			const h = await response!.allHeaders();
			expectBaseHeaders(h, path);
			expectPageCsp(h, path);
			expect(h['cache-control'], path).toBe('no-store');
		}
		const missing = await page.goto('/no-such-page');
		expect(missing?.status()).toBe(404);
		const h = await missing!.allHeaders();
		expectBaseHeaders(h, '404 page');
		expectPageCsp(h, '404 page');
		expect(h['cache-control']).toBe('no-store');

		const refused = await page.goto('/admin/users');
		expect(refused?.status()).toBe(403);
		expectBaseHeaders(await refused!.allHeaders(), '403 page');
	});

	test('API answers, API errors and downloads are never stored', async ({ request }) => {
		const health = await request.get('/api/health');
		expectBaseHeaders(health.headers(), '/api/health');
		expect(health.headers()['cache-control']).toBe('no-store');

		const me = await request.get('/api/me', { headers: bearer(tokenFor('viewer')) });
		expect(me.status()).toBe(200);
		expectBaseHeaders(me.headers(), '/api/me');
		expect(me.headers()['cache-control']).toBe('no-store');
		// JSON loads nothing: the strict fallback policy.
		expect(me.headers()['content-security-policy']).toContain("default-src 'none'");

		for (const [path, status] of [
			['/api/me', 401],
			['/api/no-such-route', 404]
		] as const) {
			const response = await request.get(path);
			expect(response.status(), path).toBe(status);
			expectBaseHeaders(response.headers(), `${path} ${status}`);
			expect(response.headers()['cache-control'], path).toBe('no-store');
		}

		const csv = await request.get('/api/print-runs/export.csv', {
			headers: bearer(tokenFor('viewer'))
		});
		expect(csv.status()).toBe(200);
		expect(csv.headers()['content-disposition']).toContain('attachment');
		expectBaseHeaders(csv.headers(), 'print-runs CSV');
		expect(csv.headers()['cache-control']).toBe('no-store');
	});

	test('pages run their scripts under the policy: no CSP violations on key pages', async ({
		page
	}) => {
		const violations: string[] = [];
		page.on('console', (message) => {
			if (/Content[- ]Security[- ]Policy|Refused to (execute|load|apply)/i.test(message.text())) {
				violations.push(`${page.url()}: ${message.text()}`);
			}
		});
		page.on('pageerror', (error) => violations.push(`${page.url()}: ${error.message}`));
		await page.goto('/signin');
		await signInAs(page, 'engineer');
		const nav = page.getByRole('navigation', { name: 'Main' });
		// The menu opens only when the page's script runs (hydrated under the nonce).
		await nav.getByRole('button', { name: 'Control charts' }).click();
		await expect(nav.getByRole('link', { name: 'Signals' })).toBeVisible();
		for (const path of ['/print-runs', '/stencils', '/charts', '/spi', '/factory', '/study']) {
			await page.goto(path);
			await expect(page.locator('h1').first()).toBeVisible();
			await page.waitForLoadState('networkidle');
		}
		await openFirstChart(page);
		expect(violations).toEqual([]);
	});
});

/** A chart page draws with layerchart (inline styles, SVG): the most script-heavy page. */
async function openFirstChart(page: Page) {
	await page.goto('/charts');
	const link = page.locator('a[href^="/charts/"]:not([href="/charts/new"])').first();
	expect(await link.count(), 'the demo data has charts').toBeGreaterThan(0);
	await link.click();
	await expect(page.getByRole('button', { name: 'CSV' })).toBeVisible();
	await page.waitForLoadState('networkidle');
}
