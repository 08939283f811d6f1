import { expect, test } from '@playwright/test';
import { request as httpRequest } from 'node:http';
import { bearer, tokenFor } from './helpers';

/**
 * Hostile bodies on ordinary routes: every body is counted on the stream, with or without a
 * Content-Length, and refused at its route's limit (README, "Limits"). After each case the
 * server still answers and nothing was stored.
 */

const port = Number(process.env.E2E_PORT);

/** Send `totalBytes` of `fill` as a chunked body (no Content-Length) and read the answer. */
function sendChunked(
	path: string,
	headers: Record<string, string>,
	totalBytes: number,
	fill = 'x'
): Promise<{ status: number; body: string; sentBytes: number }> {
	return new Promise((resolve, reject) => {
		let sentBytes = 0;
		let answered = false;
		const req = httpRequest(
			{
				host: '127.0.0.1',
				port,
				path,
				method: 'POST',
				headers: { ...headers, 'transfer-encoding': 'chunked' }
			},
			(res) => {
				answered = true;
				let body = '';
				res.setEncoding('utf8');
				res.on('data', (c) => (body += c));
				res.on('end', () => resolve({ status: res.statusCode ?? 0, body, sentBytes }));
			}
		);
		// The server may close the socket once it has answered; that is the point.
		req.on('error', (err) => (answered ? undefined : reject(err)));
		const chunk = Buffer.alloc(64 * 1024, fill);
		const pump = () => {
			while (sentBytes < totalBytes && !answered) {
				sentBytes += chunk.length;
				if (!req.write(chunk)) return void req.once('drain', pump);
			}
			req.end();
		};
		pump();
	});
}

async function healthy(request: import('@playwright/test').APIRequestContext) {
	const health = await request.get('/api/health');
	expect(health.status()).toBe(200);
}

test.describe('hostile request bodies', () => {
	test('a 200 MB chunked body on a JSON route is refused with 413 long before it is sent', async ({
		request
	}) => {
		const before = (
			await (await request.get('/api/lines', { headers: bearer(tokenFor('viewer')) })).json()
		).lines.length;
		const answer = await sendChunked(
			'/api/lines',
			{ ...bearer(tokenFor('engineer')), 'content-type': 'application/json' },
			200 * 1024 * 1024
		);
		expect(answer.status).toBe(413);
		expect(JSON.parse(answer.body).error).toMatch(/larger than the limit of 1 MB/);
		// Refused at the limit: far less than the 200 MB offered went over the wire.
		expect(answer.sentBytes).toBeLessThan(50 * 1024 * 1024);
		await healthy(request);
		const after = (
			await (await request.get('/api/lines', { headers: bearer(tokenFor('viewer')) })).json()
		).lines.length;
		expect(after).toBe(before);
	});

	test('the ad-hoc study takes files up to its larger limit and no more, chunked or not', async ({
		request
	}) => {
		const chunked = await sendChunked(
			'/api/spc/analyze',
			{ ...bearer(tokenFor('quality')), 'content-type': 'application/json' },
			60 * 1024 * 1024
		);
		expect(chunked.status).toBe(413);
		expect(JSON.parse(chunked.body).error).toMatch(/larger than the limit of 25 MB/);
		// A declared length over the limit is refused before a byte is read.
		const declared = await request.post('/api/spc/analyze', {
			headers: { ...bearer(tokenFor('quality')), 'content-type': 'application/json' },
			data: Buffer.alloc(26 * 1024 * 1024, ' ')
		});
		expect(declared.status()).toBe(413);
		await healthy(request);
	});

	test('deeply nested JSON is refused with 400 naming the depth, on every JSON reader', async ({
		request
	}) => {
		const deep = '['.repeat(200_000) + ']'.repeat(200_000);
		for (const [path, role] of [
			['/api/lines', 'engineer'],
			['/api/spc/analyze', 'quality'],
			['/api/print-runs', 'technician']
		] as const) {
			const response = await request.post(path, {
				headers: { ...bearer(tokenFor(role)), 'content-type': 'application/json' },
				data: deep
			});
			expect(response.status(), path).toBe(400);
			expect((await response.json()).error, path).toMatch(/nests deeper than 64 levels/);
		}
		await healthy(request);
	});

	test('a chunked sign-in post is bounded too', async ({ request }) => {
		const answer = await sendChunked(
			'/auth/callback/credentials',
			{ 'content-type': 'application/x-www-form-urlencoded', origin: `http://localhost:${port}` },
			20 * 1024 * 1024
		);
		expect(answer.status).toBe(413);
		await healthy(request);
	});

	test('a page form action refuses an oversized chunked form', async ({ page, request }) => {
		// Signed in through the browser: the session cookie rides along on the raw request.
		const { signInAs } = await import('./helpers');
		await signInAs(page, 'technician');
		const cookies = await page.context().cookies();
		const cookie = cookies.map((c) => `${c.name}=${c.value}`).join('; ');
		const answer = await sendChunked(
			'/signals?/acknowledge',
			{
				cookie,
				'content-type': 'application/x-www-form-urlencoded',
				origin: `http://localhost:${port}`
			},
			30 * 1024 * 1024
		);
		expect(answer.status).toBe(413);
		await healthy(request);
	});
});
