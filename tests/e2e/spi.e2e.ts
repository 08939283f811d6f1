import { expect, test } from '@playwright/test';
import { request as httpRequest } from 'node:http';
import { readFileSync } from 'node:fs';
import { bearer, signInAs, tokenFor } from './helpers';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';

/** A small canonical file with serials unique to this run (the e2e database may be reused). */
function canonicalFile(tag: string, boards = 2): string {
	const rows = [HEADER];
	for (let b = 0; b < boards; b++)
		for (let p = 1; p <= 3; p++)
			rows.push(
				`E2E-${tag}-${b},2026-03-02T08:0${b}:00Z,SMT-1,PB-100,0,C${p},1,${100 + p}.25,99.5,121,-3.5,2,${p === 3 ? 'fail' : 'pass'}`
			);
	return rows.join('\n') + '\n';
}

test.describe('SPI import API', () => {
	test('201 imported, 200 duplicate, 422 rejected with located errors, 403 for a viewer', async ({
		request
	}) => {
		const quality = bearer(tokenFor('quality'));
		const tag = String(Date.now());
		const text = canonicalFile(tag);
		const created = await request.post('/api/spi/imports?fileName=e2e.csv', {
			headers: { ...quality, 'content-type': 'text/csv' },
			data: Buffer.from(text)
		});
		expect(created.status()).toBe(201);
		const body = await created.json();
		expect(body).toMatchObject({ status: 'imported', boards: 2, pads: 6, rejectedRows: 0 });
		expect(typeof body.id).toBe('number');

		const again = await request.post('/api/spi/imports', {
			headers: { ...quality, 'content-type': 'text/csv' },
			data: Buffer.from(text)
		});
		expect(again.status()).toBe(200);
		expect(await again.json()).toEqual({ id: body.id, status: 'duplicate' });

		const bad = await request.post('/api/spi/imports', {
			headers: { ...quality, 'content-type': 'text/csv' },
			data: Buffer.from(
				text.replace('101.25', 'lots') +
					`E2E-${tag}-x,yesterday,SMT-1,PB-100,0,C1,1,1,1,1,1,1,pass\n`
			)
		});
		expect(bad.status()).toBe(422);
		const rejected = await bad.json();
		expect(rejected.status).toBe('rejected');
		expect(rejected.errors[0]).toEqual({
			row: 2,
			column: 'volume_pct',
			message: expect.stringContaining('lots')
		});
		expect(rejected.errors.some((e: { column: string }) => e.column === 'inspected_at')).toBe(true);

		const detail = await request.get(`/api/spi/imports/${body.id}`, {
			headers: bearer(tokenFor('viewer'))
		});
		expect(detail.status()).toBe(200);
		expect(await detail.json()).toMatchObject({ id: body.id, status: 'imported', pads: 6 });

		const viewer = await request.post('/api/spi/imports', {
			headers: { ...bearer(tokenFor('viewer')), 'content-type': 'text/csv' },
			data: Buffer.from(text)
		});
		expect(viewer.status()).toBe(403);
	});

	test('multipart upload with a profile; every broken fixture gets a clear answer', async ({
		request,
		baseURL
	}) => {
		const quality = bearer(tokenFor('quality'));
		// SvelteKit refuses multipart posts whose Origin is not the app's own (CSRF check), so
		// API clients send it (README).
		const multipart = await request.post('/api/spi/imports', {
			headers: { ...quality, origin: new URL(baseURL as string).origin },
			multipart: {
				profile: '',
				file: {
					name: 'multi.csv',
					mimeType: 'text/csv',
					buffer: Buffer.from(canonicalFile(`${Date.now()}m`, 1))
				}
			}
		});
		expect(multipart.status()).toBe(201);
		for (const file of [
			'empty.csv',
			'header-only.csv',
			'binary-garbage.csv',
			'wrong-columns.csv'
		]) {
			const res = await request.post(`/api/spi/imports?fileName=${file}`, {
				headers: { ...quality, 'content-type': 'text/csv' },
				data: readFileSync(`tests/fixtures/spi/${file}`)
			});
			expect(res.status(), file).toBe(422);
			const json = await res.json();
			expect(json.errors[0].message.length, file).toBeGreaterThan(5);
		}
		const health = await request.get('/api/health');
		expect(health.status()).toBe(200);
	});

	test('a 2 GB upload is refused with 413 and a clear message before the body is read', async ({
		baseURL
	}) => {
		const url = new URL('/api/spi/imports', baseURL);
		const answer = await new Promise<{ status: number; body: string }>((resolve, reject) => {
			const req = httpRequest(url, {
				method: 'POST',
				headers: {
					...bearer(tokenFor('quality')),
					'content-type': 'text/csv',
					'content-length': String(2 * 1024 ** 3)
				}
			});
			req.on('response', (res) => {
				let body = '';
				res.on('data', (c) => (body += c));
				res.on('end', () => {
					resolve({ status: res.statusCode ?? 0, body });
					req.destroy();
				});
			});
			req.on('error', reject);
			req.write(HEADER + '\n'); // a first piece only: the 2 GB never exist
		});
		expect(answer.status).toBe(413);
		expect(JSON.parse(answer.body).error).toMatch(
			/2048 MB.*largest accepted file is \d+ MB \(MAX_UPLOAD_MB\)/
		);
	});

	test('boards: search by serial and detail with pads as numbers', async ({ request }) => {
		const quality = bearer(tokenFor('quality'));
		const tag = `${Date.now()}b`;
		await request.post('/api/spi/imports', {
			headers: { ...quality, 'content-type': 'text/csv' },
			data: Buffer.from(canonicalFile(tag, 1))
		});
		const viewer = bearer(tokenFor('viewer'));
		const found = await request.get(`/api/boards?serial=E2E-${tag}-0`, { headers: viewer });
		expect(found.status()).toBe(200);
		const { boards } = await found.json();
		expect(boards).toHaveLength(1);
		expect(boards[0]).toMatchObject({
			serial: `E2E-${tag}-0`,
			inspectedAt: '2026-03-02T08:00:00.000Z',
			line: 'SMT-1',
			product: 'PB-100',
			padCount: 3
		});
		const detail = await request.get(`/api/boards/${boards[0].id}`, { headers: viewer });
		const board = await detail.json();
		expect(board.pads[0]).toMatchObject({
			refdes: 'C1',
			pad: '1',
			volumePct: 101.25,
			areaPct: 99.5,
			heightUm: 121,
			offsetXUm: -3.5,
			offsetYUm: 2,
			result: 'pass'
		});
		expect((await request.get('/api/boards/999999999', { headers: viewer })).status()).toBe(404);
	});
});

test.describe('SPI pages', () => {
	test('upload two files through the page: progress, then a summary for each with a link', async ({
		page
	}) => {
		await signInAs(page, 'quality');
		await page.goto('/spi/upload');
		await page.locator('#files').setInputFiles([
			{
				name: 'page-good.csv',
				mimeType: 'text/csv',
				buffer: Buffer.from(canonicalFile(`${Date.now()}p`, 3))
			},
			{
				name: 'page-bad.csv',
				mimeType: 'text/csv',
				buffer: readFileSync('tests/fixtures/spi/non-numeric.csv')
			}
		]);
		await expect(page.getByTestId('upload-item')).toHaveCount(2);
		await page.getByRole('button', { name: /Import 2 files/ }).click();
		const summaries = page.getByTestId('upload-summary');
		await expect(summaries).toHaveCount(2);
		await expect(summaries.nth(0)).toContainText('Imported: 3 boards, 9 pads, 0 rejected rows');
		await expect(summaries.nth(1)).toContainText('Rejected: nothing stored');
		await expect(page.getByRole('progressbar').first()).toBeVisible();
		await summaries
			.nth(0)
			.getByRole('link', { name: /Open import/ })
			.click();
		await expect(page.getByTestId('import-summary')).toContainText('imported');
		await expect(page.getByRole('link', { name: /E2E-.*-0/ })).toBeVisible();
	});

	test('board search and a demo board with its aperture map and pads', async ({ page }) => {
		await signInAs(page, 'viewer');
		await page.goto('/boards');
		await page.getByLabel('Board serial').fill('FW-PB100-0100001');
		await page.getByRole('button', { name: 'Search' }).click();
		await page.getByTestId('board-list').getByRole('link', { name: 'FW-PB100-0100001' }).click();
		await expect(page.getByRole('heading', { name: 'FW-PB100-0100001' })).toBeVisible();
		await expect(page.getByTestId('volume-map')).toBeVisible();
		await expect(page.getByTestId('pad-table').locator('tbody tr').first()).toBeVisible();
		await page.goto('/spi');
		await expect(page.getByTestId('import-list')).toContainText('smt1-spi-');
	});
});
