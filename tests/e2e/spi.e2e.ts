import { expect, test } from '@playwright/test';
import { request as httpRequest } from 'node:http';
import { readFileSync } from 'node:fs';
import Database from 'better-sqlite3';
import { bearer, E2E_DATABASE, signInAs, tokenFor } from './helpers';

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
		// A file chosen before the page has hydrated is not seen by it.
		await expect(page.getByTestId('drop-zone')).toHaveAttribute('data-hydrated', 'true');
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
		// The demo's first inspected PB-100 board (its serial is the one its print run logged).
		const db = new Database(E2E_DATABASE, { readonly: true });
		const serial = db
			.prepare(
				`select serial from spi_boards where serial like 'FW-PB100-%' order by serial limit 1`
			)
			.pluck()
			.get() as string;
		db.close();
		await page.goto('/boards');
		await page.getByLabel('Board serial').fill(serial);
		await page.getByRole('button', { name: 'Search' }).click();
		await page.getByTestId('board-list').getByRole('link', { name: serial }).click();
		await expect(page.getByRole('heading', { name: serial })).toBeVisible();
		await expect(page.getByTestId('volume-map')).toBeVisible();
		await expect(page.getByTestId('pad-table').locator('tbody tr').first()).toBeVisible();
		await page.goto('/spi');
		await expect(page.getByTestId('import-list')).toContainText('smt1-spi-');
	});
});

/** An export in another layout: semicolons, decimal commas, mm, local time, OK/Warning/NG. */
function x1Export(tag: string): string {
	return (
		[
			'Barcode;Date;Program;Array;Component;Pin;Volume(%);Area(%);Height(mm);X Shift(mm);Y Shift(mm);Judgement',
			`E2E-X1-${tag}-1;02.03.2026 09:15:00;E2E-X1;1;C1;1;98,5;101,2;0,1214;0,0055;-0,00325;OK`,
			`E2E-X1-${tag}-1;02.03.2026 09:15:00;E2E-X1;1;R7;1;61;88,4;0,0962;0,01275;-0,008;NG`,
			`E2E-X1-${tag}-2;02.03.2026 09:16:30;E2E-X1;1;C1;1;104,5;103,1;0,1239;0,00325;-0,00175;Warning`
		].join('\n') + '\n'
	);
}

const X1_COLUMNS: Record<string, string> = {
	board_serial: 'Barcode',
	inspected_at: 'Date',
	product: 'Program',
	panel_index: 'Array',
	refdes: 'Component',
	pad: 'Pin',
	volume_pct: 'Volume(%)',
	area_pct: 'Area(%)',
	height_um: 'Height(mm)',
	offset_x_um: 'X Shift(mm)',
	offset_y_um: 'Y Shift(mm)',
	result: 'Judgement'
};

test.describe('SPI mapping profiles', () => {
	test('a sample with semicolons and decimal commas: map, save, import a file with the profile', async ({
		page,
		request
	}) => {
		const tag = String(Date.now());
		const name = `E2E X1 ${tag}`;
		const file = x1Export(tag);
		await signInAs(page, 'quality');
		await page.goto('/spi/profiles/new');
		await page
			.locator('#sample')
			.setInputFiles({ name: 'x1-sample.csv', mimeType: 'text/csv', buffer: Buffer.from(file) });
		await expect(page.getByText('delimiter “;”, numbers with a decimal comma')).toBeVisible();
		const preview = page.getByTestId('sample-preview');
		await expect(preview.locator('thead th')).toHaveCount(12);
		await expect(preview.locator('tbody tr')).toHaveCount(3);
		await expect(preview.locator('tbody tr').first()).toContainText('0,1214');
		await expect(page.getByLabel(/decimal comma/)).toBeChecked();

		await page.getByLabel('Profile name').fill(name);
		await page.getByLabel('Inspection machine').fill('E2E inspector (invented layout)');
		for (const [field, header] of Object.entries(X1_COLUMNS)) {
			await page.locator(`#col-${field}`).fill(header);
		}
		await page.getByLabel('Height and offset unit').selectOption('mm');
		await page.getByLabel('Timestamp format').fill('DD.MM.YYYY HH:mm:ss');
		await page.getByLabel('Time zone (times without offset)').fill('Europe/Berlin');
		await page.getByLabel('Words for pass').fill('OK');
		await page.getByLabel('Words for warn').fill('Warning');
		await page.getByLabel('Words for fail').fill('NG');
		await page.getByLabel('Line (when the file has none)').fill('L2');
		await expect(page.getByTestId('trial')).toContainText('3 of 3 sample rows read, 2 board(s)');
		await page.getByRole('button', { name: 'Save profile' }).click();
		await expect(page).toHaveURL(/\/spi\/profiles$/);
		const row = page.getByTestId('profile-list').locator('tr', { hasText: name });
		await expect(row).toContainText('auto, decimal comma');
		await expect(row).toContainText('mm, volume percent');
		await expect(row).toContainText('Europe/Berlin');

		await page.goto('/spi/upload');
		await page
			.getByLabel('Mapping profile')
			.selectOption({ label: `${name} · E2E inspector (invented layout)` });
		// A file chosen before the page has hydrated is not seen by it: choose again until it is.
		await expect(async () => {
			await page
				.locator('#files')
				.setInputFiles({ name: `x1-${tag}.csv`, mimeType: 'text/csv', buffer: Buffer.from(file) });
			await expect(page.getByRole('button', { name: /Import 1 file/ })).toBeVisible({
				timeout: 2_000
			});
		}).toPass({ timeout: 30_000 });
		await page.getByRole('button', { name: /Import 1 file/ }).click();
		await expect(page.getByTestId('upload-summary')).toContainText(
			'Imported: 2 boards, 3 pads, 0 rejected rows'
		);

		const viewer = bearer(tokenFor('viewer'));
		const found = await request.get(`/api/boards?serial=E2E-X1-${tag}-1`, { headers: viewer });
		const [board] = (await found.json()).boards;
		// 09:15 in Berlin on 2 March 2026 (CET, UTC+1) is 08:15 UTC; the line comes from the profile.
		expect(board).toMatchObject({
			inspectedAt: '2026-03-02T08:15:00.000Z',
			line: 'L2',
			padCount: 2
		});
		const pads = (await (await request.get(`/api/boards/${board.id}`, { headers: viewer })).json())
			.pads;
		// 0,0962 mm = 96.2 µm, 0,01275 mm = 12.75 µm, -0,008 mm = -8 µm; NG = fail
		expect(pads.find((p: { refdes: string }) => p.refdes === 'R7')).toMatchObject({
			volumePct: 61,
			areaPct: 88.4,
			heightUm: 96.2,
			offsetXUm: 12.75,
			offsetYUm: -8,
			result: 'fail'
		});
		expect(pads.find((p: { refdes: string }) => p.refdes === 'C1')).toMatchObject({
			volumePct: 98.5,
			heightUm: 121.4,
			result: 'pass'
		});

		// The profile is now referenced by an import: the page refuses to delete it and says why.
		await page.goto('/spi/profiles');
		await page.getByRole('button', { name: `Delete profile ${name}` }).click();
		await page.getByRole('button', { name: 'Yes, delete' }).click();
		await expect(page.getByTestId('delete-error')).toContainText(
			`Profile "${name}" was used by 1 import`
		);
		await expect(page.getByTestId('profile-list')).toContainText(name);
	});

	test('DELETE /api/spi/profiles/{id}: 204 once, then 404; 409 when used; 403 for a viewer; page confirmation', async ({
		request,
		page
	}) => {
		const quality = bearer(tokenFor('quality'));
		const tag = String(Date.now());
		const profile = JSON.parse(readFileSync('tests/fixtures/spi/example-x1.profile.json', 'utf8'));
		const create = async (name: string) => {
			const res = await request.post('/api/spi/profiles', {
				headers: quality,
				data: { ...profile, name }
			});
			expect(res.status()).toBe(201);
			return (await res.json()).id as number;
		};
		const unused = await create(`E2E unused ${tag}`);
		const viewer = await request.delete(`/api/spi/profiles/${unused}`, {
			headers: bearer(tokenFor('viewer'))
		});
		expect(viewer.status()).toBe(403);
		const gone = await request.delete(`/api/spi/profiles/${unused}`, { headers: quality });
		expect(gone.status()).toBe(204);
		expect(await gone.text()).toBe('');
		const again = await request.delete(`/api/spi/profiles/${unused}`, { headers: quality });
		expect(again.status()).toBe(404);
		expect(await again.json()).toEqual({ error: `No mapping profile ${unused}.` });

		const used = await create(`E2E used ${tag}`);
		const imported = await request.post(`/api/spi/imports?fileName=x1-${tag}.csv&profile=${used}`, {
			headers: { ...quality, 'content-type': 'text/csv' },
			data: Buffer.from(x1Export(`${tag}d`))
		});
		expect(imported.status()).toBe(201);
		const refused = await request.delete(`/api/spi/profiles/${used}`, { headers: quality });
		expect(refused.status()).toBe(409);
		expect((await refused.json()).error).toBe(
			`Profile "E2E used ${tag}" was used by 1 import (the first is import ${(await imported.json()).id}) ` +
				'and is kept so they still show how they were read. Edit it, or save a new profile under another name.'
		);
		expect((await request.get(`/api/spi/profiles/${used}`, { headers: quality })).status()).toBe(
			200
		);

		// Through the page: the first click only asks; "Keep" leaves it; "Yes, delete" removes it.
		const name = `E2E page ${tag}`;
		await create(name);
		await signInAs(page, 'engineer');
		await page.goto('/spi/profiles');
		const list = page.getByTestId('profile-list');
		await page.getByRole('button', { name: `Delete profile ${name}` }).click();
		await expect(page.getByText(`Delete “${name}”?`)).toBeVisible();
		await page.getByRole('button', { name: 'Keep' }).click();
		await expect(list).toContainText(name);
		await page.getByRole('button', { name: `Delete profile ${name}` }).click();
		await page.getByRole('button', { name: 'Yes, delete' }).click();
		await expect(page.getByText(`Profile “${name}” deleted.`)).toBeVisible();
		await expect(list).not.toContainText(name);
	});
});

test.describe('Failing-pads Pareto', () => {
	test('failing refdes and pads of one product in one period, most failures first', async ({
		page,
		request
	}) => {
		const tag = String(Date.now());
		const product = `E2E-PARETO-${tag}`;
		// Four boards on 1 April: U7 pad 3 fails on three of them, R2 pad 1 on one; C1 warns once.
		// A fifth board on 2 April fails U7 too but lies outside the chosen period.
		const rows = [HEADER];
		const pad = (b: number, day: string, refdes: string, p: string, result: string) =>
			rows.push(
				`E2E-P-${tag}-${b},2026-04-0${day}T10:0${b}:00Z,SMT-1,${product},0,${refdes},${p},100,100,120,0,0,${result}`
			);
		for (let b = 0; b < 4; b++) {
			pad(b, '1', 'U7', '3', b < 3 ? 'fail' : 'pass');
			pad(b, '1', 'R2', '1', b === 0 ? 'fail' : 'pass');
			pad(b, '1', 'C1', '1', b === 1 ? 'warn' : 'pass');
		}
		pad(4, '2', 'U7', '3', 'fail');
		const res = await request.post('/api/spi/imports?fileName=pareto.csv', {
			headers: { ...bearer(tokenFor('quality')), 'content-type': 'text/csv' },
			data: Buffer.from(rows.join('\n') + '\n')
		});
		expect(res.status()).toBe(201);

		await signInAs(page, 'viewer');
		await page.goto('/spi/pareto');
		await page.getByLabel('Product', { exact: true }).selectOption(product);
		await page.getByLabel('From', { exact: true }).fill('2026-04-01');
		await page.getByLabel('To', { exact: true }).fill('2026-04-01');
		await page.getByRole('button', { name: 'Show' }).click();
		await expect(
			page.getByText(`4 board inspection(s) of ${product} from 2026-04-01 to 2026-04-01`)
		).toBeVisible();
		const refdes = page.getByTestId('pareto-refdes').locator('tbody tr');
		await expect(refdes).toHaveCount(2);
		// fails, warns, cumulative share of the fails: 3 of 4 = 75 %, then 100 %
		await expect(refdes.nth(0).locator('td')).toHaveText(['U7', '3', '0', '75 %']);
		await expect(refdes.nth(1).locator('td')).toHaveText(['R2', '1', '0', '100 %']);
		const pads = page.getByTestId('pareto-pad').locator('tbody tr');
		await expect(pads.nth(0).locator('td')).toHaveText(['U7.3', '3', '0', '75 %']);
		await expect(pads.nth(1).locator('td')).toHaveText(['R2.1', '1', '0', '100 %']);

		// Widening the period to 2 April takes in the fifth board.
		await page.getByLabel('To', { exact: true }).fill('2026-04-02');
		await page.getByRole('button', { name: 'Show' }).click();
		await expect(refdes.nth(0).locator('td')).toHaveText(['U7', '4', '0', '80 %']);
	});

	test('the demo factory: the low-printing BGA U2 tops the failing components of PB-100', async ({
		page
	}) => {
		await signInAs(page, 'viewer');
		await page.goto('/spi/pareto?product=PB-100');
		const first = page.getByTestId('pareto-refdes').locator('tbody tr').first();
		await expect(first.locator('td').first()).toHaveText('U2');
		expect(Number(await first.locator('td').nth(1).textContent())).toBeGreaterThan(0);
	});
});
