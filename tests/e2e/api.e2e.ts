import { expect, test } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

test.describe('JSON API access', () => {
	test('health answers without credentials', async ({ request }) => {
		const response = await request.get('/api/health');
		expect(response.status()).toBe(200);
		expect(await response.json()).toEqual({ status: 'ok' });
	});

	test('no token is 401, a malformed or unknown one too, each with JSON', async ({ request }) => {
		const none = await request.get('/api/me');
		expect(none.status()).toBe(401);
		expect((await none.json()).error).toContain('Sign-in required');
		const malformed = await request.get('/api/me', { headers: { Authorization: 'Token abc' } });
		expect(malformed.status()).toBe(401);
		const unknown = await request.get('/api/me', {
			headers: bearer('rb_' + 'x'.repeat(43))
		});
		expect(unknown.status()).toBe(401);
		expect(await unknown.json()).toEqual({ error: 'The Bearer token is not known.' });
	});

	test('a viewer token on an admin route is 403; an admin token is 200', async ({ request }) => {
		const viewer = await request.get('/api/users', { headers: bearer(tokenFor('viewer')) });
		expect(viewer.status()).toBe(403);
		expect(await viewer.json()).toEqual({ error: 'The role "viewer" may not use this route.' });
		const admin = await request.get('/api/users', { headers: bearer(tokenFor('admin')) });
		expect(admin.status()).toBe(200);
		const body = await admin.json();
		expect(body.users.map((u: { role: string }) => u.role)).toEqual(
			expect.arrayContaining(['admin', 'engineer', 'technician', 'quality', 'viewer'])
		);
		expect(JSON.stringify(body)).not.toContain('password');
	});

	test('/api/me tells the caller who they are', async ({ request }) => {
		const response = await request.get('/api/me', { headers: bearer(tokenFor('technician')) });
		expect(response.status()).toBe(200);
		expect(await response.json()).toMatchObject({ kind: 'token', role: 'technician' });
	});

	test('lines: engineers create, codes are unique, bad input is named, viewers read only', async ({
		request
	}) => {
		const code = `L-${Date.now() % 100000}`;
		const engineer = bearer(tokenFor('engineer'));
		const created = await request.post('/api/lines', {
			headers: engineer,
			data: { code, name: 'Test line' }
		});
		expect(created.status()).toBe(201);
		expect(await created.json()).toMatchObject({ code, name: 'Test line', active: true });

		const duplicate = await request.post('/api/lines', {
			headers: engineer,
			data: { code, name: 'Again' }
		});
		expect(duplicate.status()).toBe(409);

		const bad = await request.post('/api/lines', {
			headers: engineer,
			data: { code: 'has space', name: '' }
		});
		expect(bad.status()).toBe(400);
		const fields = (await bad.json()).fields.map((f: { field: string }) => f.field);
		expect(fields).toEqual(expect.arrayContaining(['code', 'name']));

		const notJson = await request.post('/api/lines', {
			headers: { ...engineer, 'Content-Type': 'application/json' },
			data: Buffer.from('{not json')
		});
		expect(notJson.status()).toBe(400);
		expect(await notJson.json()).toEqual({ error: 'The request body is not valid JSON.' });

		const viewer = bearer(tokenFor('viewer'));
		expect(
			(
				await request.post('/api/lines', { headers: viewer, data: { code: 'X1', name: 'x' } })
			).status()
		).toBe(403);
		const list = await request.get('/api/lines', { headers: viewer });
		expect((await list.json()).lines.map((l: { code: string }) => l.code)).toContain(code);
	});

	test('products: create and list', async ({ request }) => {
		const code = `P-${Date.now() % 100000}`;
		const admin = bearer(tokenFor('admin'));
		expect(
			(
				await request.post('/api/products', { headers: admin, data: { code, name: 'Test board' } })
			).status()
		).toBe(201);
		const list = await request.get('/api/products', { headers: bearer(tokenFor('quality')) });
		const codes = (await list.json()).products.map((p: { code: string }) => p.code);
		expect(codes).toEqual(expect.arrayContaining(['PB-100', 'SH-220', 'LM-48', code]));
	});

	test('an unknown API path is a JSON 404', async ({ request }) => {
		const response = await request.get('/api/no-such-thing', {
			headers: bearer(tokenFor('admin'))
		});
		expect(response.status()).toBe(404);
		expect((await response.json()).error).toContain('No API route');
	});
});

test.describe('cross-site protection', () => {
	test('a Bearer-token multipart post without an Origin header reaches the route', async ({
		request
	}) => {
		const response = await request.post('/api/lines', {
			headers: bearer(tokenFor('engineer')),
			multipart: { code: 'MP-1', name: 'multipart' }
		});
		// The route wants JSON, so it answers 400 — the point is that it was not refused as cross-site.
		expect(response.status()).toBe(400);
		expect(await response.json()).toEqual({ error: 'The request body is not valid JSON.' });
	});

	test('a form post from another site is refused, even with a signed-in session', async ({
		page,
		baseURL
	}) => {
		await signInAs(page, 'engineer');
		const response = await page.request.post(`${baseURL}/factory?/addLine`, {
			headers: { Origin: 'https://evil.example' },
			form: { code: 'EVIL-1', name: 'forged' }
		});
		expect(response.status()).toBe(403);
		expect(await response.text()).toBe('Cross-site POST form submissions are forbidden');
		const lines = await page.request.get(`${baseURL}/api/lines`);
		expect(JSON.stringify(await lines.json())).not.toContain('EVIL-1');
	});
});
