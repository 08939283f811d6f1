import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

const FIXTURES = 'tests/fixtures/stencil';

test.describe('stencil design check', () => {
	test('an engineer creates a stencil, imports a Gerber and a CSV, finds the failures and exports them', async ({ page }) => {
		await signInAs(page, 'engineer');
		await page.goto('/stencils');
		const name = `ST-E2E-${Date.now() % 1_000_000}`;
		const create = page.locator('form[action="?/create"]');
		await create.getByLabel('Name (label text)').fill(name);
		await create.getByLabel('Revision').fill('A');
		await create.getByLabel('Foil thickness (µm)').fill('127');
		await create.getByLabel('Technology').selectOption('laser-stainless');
		await create.getByRole('button', { name: 'Create stencil' }).click();
		await expect(page.getByRole('heading', { level: 1 })).toContainText(name);
		await expect(page.getByText('No apertures yet')).toBeVisible();

		// Gerber with a centroid file: 7 apertures, named U7, U1, C3, J2.
		const panel = page.getByTestId('import-form');
		await panel.getByLabel('Aperture file (CSV or Gerber)').setInputFiles(`${FIXTURES}/paste-top.gbr`);
		await panel.getByLabel('Centroid CSV for Gerber (optional)').setInputFiles(`${FIXTURES}/centroids.csv`);
		await panel.getByLabel('Centroid unit').selectOption('mm');
		await panel.getByRole('button', { name: 'Import apertures' }).click();
		await expect(page.getByTestId('import-done')).toContainText('Imported 7 apertures from GERBER');

		// A CSV with a bad cell is refused with its line and column; nothing is added.
		await panel.getByLabel('Aperture file (CSV or Gerber)').setInputFiles(`${FIXTURES}/bad-apertures.csv`);
		await panel.getByLabel('CSV unit').selectOption('mm');
		await panel.getByRole('button', { name: 'Import apertures' }).click();
		await expect(page.getByTestId('import-errors')).toContainText('line 3, width: must be a number (got "wide")');

		await panel.getByLabel('Aperture file (CSV or Gerber)').setInputFiles(`${FIXTURES}/apertures.csv`);
		await panel.getByLabel('CSV unit').selectOption('mm');
		await panel.getByRole('button', { name: 'Import apertures' }).click();
		await expect(page.getByTestId('import-done')).toContainText('Imported 4 apertures from CSV; the stencil now holds 11');

		// Failing at 127 µm: two 0.25 mm circles (0.49), two 1.0 × 0.2 mm pads (0.656), two 0201 pads (0.570).
		await expect(page.getByTestId('fail-count')).toHaveText('✕ 6 fail');
		const map = page.getByTestId('aperture-map');
		await expect(map.locator('path[data-status="fail"]')).toHaveCount(6);
		await expect(map.locator('path[data-status="pass"]')).toHaveCount(5);
		await expect(map).toContainText('Fail (hatched, dashed outline)');

		const table = page.getByTestId('aperture-table');
		await page.getByLabel('Status').selectOption('fail');
		await expect(page.getByTestId('aperture-count')).toHaveText('6 of 11 apertures');
		await expect(table.locator('tbody tr[data-status="fail"]')).toHaveCount(6);
		await expect(table.locator('tbody tr[data-status="pass"]')).toHaveCount(0);
		await expect(table).toContainText('U7.1');
		await page.getByLabel('Status').selectOption('all');

		// A click on a failing aperture in the map selects its row.
		await map.locator('path[data-status="fail"]').first().click({ force: true });
		const selected = table.locator('tbody tr[aria-selected="true"]');
		await expect(selected).toHaveCount(1);
		await expect(selected).toHaveAttribute('data-status', 'fail');
		await expect(map.getByTestId('map-selected')).toHaveCount(1);

		const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('export-csv').click()]);
		const csv = readFileSync((await download.path())!, 'utf8');
		const lines = csv.trim().split(/\r\n/);
		expect(lines[0]).toContain(`${name} rev A, 127 µm laser-stainless`);
		expect(lines[1].split(',').slice(0, 3)).toEqual(['refdes', 'pad', 'shape']);
		expect(lines).toHaveLength(2 + 11);
		const r9 = lines.find((l) => l.startsWith('R9,1,'))!.split(',');
		const header = lines[1].split(',');
		// 0201 pad 300 × 280 µm at 127 µm: AR = 84000 / (1160 × 127) (first principles), unrounded.
		expect(Number(r9[header.indexOf('area_ratio')])).toBeCloseTo(84000 / (1160 * 127), 12);
		expect(r9[header.indexOf('status')]).toBe('fail');
		expect(lines.filter((l) => l.includes(',fail,'))).toHaveLength(6);

		await page.goto(page.url() + '/report');
		await expect(page.getByTestId('stencil-report')).toContainText('Failing apertures (6)');
	});

	test('a viewer reads stencils but cannot create one', async ({ page, request }) => {
		await signInAs(page, 'viewer');
		await page.goto('/stencils');
		await expect(page.getByRole('heading', { name: 'Stencils', level: 1 })).toBeVisible();
		await expect(page.getByRole('link', { name: 'ST-PB100' }).first()).toBeVisible();
		await expect(page.locator('form[action="?/create"]')).toHaveCount(0);
		const refused = await page.request.post('/stencils?/create', {
			headers: { origin: new URL(page.url()).origin },
			form: { name: 'X', revision: 'A', thicknessUm: '100', technology: 'laser-stainless' }
		});
		expect(refused.status()).toBe(403);
		const api = await request.post('/api/stencils', {
			headers: bearer(tokenFor('viewer')),
			data: { name: 'ST-NOPE', revision: 'A', thicknessUm: 100, technology: 'laser-stainless' }
		});
		expect(api.status()).toBe(403);
	});

	test('revision history, comparison and site thresholds', async ({ page }) => {
		await signInAs(page, 'engineer');
		await page.goto('/stencils');
		await page.getByRole('row').filter({ hasText: 'Step stencil' }).getByRole('link', { name: 'ST-PB100' }).click();
		await expect(page.getByRole('heading', { level: 1 })).toContainText('rev B');
		await expect(page.getByTestId('revision-history')).toContainText('A');
		await page.getByLabel('Compare with another revision').selectOption({ label: 'rev A' });
		await page.getByRole('button', { name: 'Compare', exact: true }).click();
		await expect(page.getByRole('heading', { level: 1 })).toContainText('Rev A → rev B');
		// Demo rev B widens the 32 QFN pads of U1 from 220 to 250 µm; nothing else moves.
		await expect(page.getByTestId('compare-counts')).toContainText('Changed32');
		await expect(page.getByRole('row').filter({ hasText: 'U1.1' }).first()).toContainText('700 × 220 → 700 × 250');

		await page.goto('/stencils/thresholds');
		const area = page.getByLabel('Minimum area ratio, Electroformed');
		await expect(area).toHaveValue('0.66');
		await area.fill('0');
		await page.getByRole('button', { name: 'Save thresholds' }).click();
		await expect(page.getByRole('alert')).toContainText('nothing was saved');
		await expect(page.locator('#electroformed-minAreaRatio-error')).toContainText('greater than 0');
		await area.fill('0.55');
		await page.getByRole('button', { name: 'Save thresholds' }).click();
		await expect(page.getByRole('status')).toContainText('Thresholds saved');
		await page.reload();
		await expect(page.getByLabel('Minimum area ratio, Electroformed')).toHaveValue('0.55');
		await page.getByLabel('Minimum area ratio, Electroformed').fill('0.66');
		await page.getByRole('button', { name: 'Save thresholds' }).click();
		await expect(page.getByRole('status')).toContainText('Thresholds saved');
	});

	test('API contract: create, import JSON, read figures; bad CSV names row and column and stores nothing', async ({ request, baseURL }) => {
		const engineer = bearer(tokenFor('engineer'));
		const name = `ST-API-${Date.now() % 1_000_000}`;
		const created = await request.post('/api/stencils', {
			headers: engineer,
			data: { name, revision: 'A', thicknessUm: 100, technology: 'laser-stainless' }
		});
		expect(created.status()).toBe(201);
		const stencil = await created.json();
		expect(stencil).toMatchObject({ name, revision: 'A', thicknessUm: 100, technology: 'laser-stainless', apertureCount: 0 });
		expect(Number.isInteger(stencil.id)).toBe(true);

		const again = await request.post('/api/stencils', {
			headers: engineer,
			data: { name, revision: 'A', thicknessUm: 100, technology: 'laser-stainless' }
		});
		expect(again.status()).toBe(409);

		const badBody = await request.post('/api/stencils', { headers: engineer, data: { name: '', thicknessUm: -1 } });
		expect(badBody.status()).toBe(400);

		const url = `/api/stencils/${stencil.id}/apertures`;
		const imported = await request.post(url, {
			headers: engineer,
			data: {
				apertures: [
					{ refdes: 'U1', pad: '1', shape: 'rectangle', lengthUm: 1000, widthUm: 200, xUm: 0, yUm: 0 },
					{ refdes: 'U7', pad: 'A1', shape: 'circle', diameterUm: 250, xUm: 2000, yUm: 0 },
					{ refdes: 'Q1', pad: '3', shape: 'polygon', verticesUm: [[-500, -300], [500, -300], [500, 300], [-500, 300]] }
				]
			}
		});
		expect(imported.status()).toBe(201);
		expect(await imported.json()).toMatchObject({ count: 3, totalApertures: 3, source: 'json', mode: 'append', warnings: [] });

		const badJson = await request.post(url, {
			headers: engineer,
			data: { apertures: [{ refdes: 'U2', pad: '1', shape: 'rectangle', lengthUm: 300, widthUm: 200, cornerRadiusUm: 150 }] }
		});
		expect(badJson.status()).toBe(400);
		expect((await badJson.json()).fields.map((f: { field: string }) => f.field)).toContain('apertures[0].cornerRadiusUm');

		// Browsers send an Origin header with multipart posts; SvelteKit refuses form posts without one.
		const badCsv = await request.post(url, {
			headers: { ...engineer, origin: new URL(url, baseURL).origin },
			multipart: {
				file: { name: 'bad-apertures.csv', mimeType: 'text/csv', buffer: readFileSync(`${FIXTURES}/bad-apertures.csv`) },
				unit: 'mm'
			}
		});
		expect(badCsv.status()).toBe(422);
		const refusal = await badCsv.json();
		expect(refusal.error).toContain('nothing was imported');
		expect(refusal.errors).toEqual([
			{ file: 'bad-apertures.csv', line: 3, column: 'width', message: 'line 3, width: must be a number (got "wide")' }
		]);

		// Scripts can send the file as the raw body instead, with options in the query string.
		const rawBad = await request.post(`${url}?unit=mm&fileName=bad.csv`, {
			headers: { ...engineer, 'content-type': 'text/csv' },
			data: readFileSync(`${FIXTURES}/bad-apertures.csv`)
		});
		expect(rawBad.status()).toBe(422);
		expect((await rawBad.json()).errors[0]).toMatchObject({ file: 'bad.csv', line: 3, column: 'width' });
		const rawGerber = await request.post(`${url}?fileName=paste-top.gbr&mode=replace`, {
			headers: { ...engineer, 'content-type': 'application/octet-stream' },
			data: readFileSync(`${FIXTURES}/paste-top.gbr`)
		});
		expect(rawGerber.status()).toBe(201);
		expect(await rawGerber.json()).toMatchObject({ source: 'gerber', unit: 'mm', mode: 'replace', count: 7, totalApertures: 7 });
		// Put the three JSON apertures back for the checks below.
		expect(
			(
				await request.post(url, {
					headers: engineer,
					data: {
						mode: 'replace',
						apertures: [
							{ refdes: 'U1', pad: '1', shape: 'rectangle', lengthUm: 1000, widthUm: 200, xUm: 0, yUm: 0 },
							{ refdes: 'U7', pad: 'A1', shape: 'circle', diameterUm: 250, xUm: 2000, yUm: 0 },
							{ refdes: 'Q1', pad: '3', shape: 'polygon', verticesUm: [[-500, -300], [500, -300], [500, 300], [-500, 300]] }
						]
					}
				})
			).status()
		).toBe(201);

		const read = await request.get(url, { headers: bearer(tokenFor('viewer')) });
		expect(read.status()).toBe(200);
		const { apertures } = await read.json();
		expect(apertures).toHaveLength(3);
		const [rect, circle, polygon] = apertures;
		for (const a of apertures)
			for (const field of ['thicknessUm', 'areaUm2', 'perimeterUm', 'areaRatio', 'aspectRatio', 'volumeUm3', 'status', 'reasons'])
				expect(a, field).toHaveProperty(field);
		// 0.2 × 1.0 mm at 100 µm: AR 200000 / (2400 × 100), aspect 2.0, volume 2e7 µm³ (worked-examples.json).
		expect(rect).toMatchObject({ refdes: 'U1', pad: '1', shape: 'rectangle', lengthUm: 1000, widthUm: 200, thicknessUm: 100, areaUm2: 200000, perimeterUm: 2400, aspectRatio: 2, volumeUm3: 20000000, status: 'pass', reasons: [] });
		expect(rect.areaRatio).toBeCloseTo(0.8333333333333334, 15);
		// Circle: AR = D / 4T = 250 / 400 = 0.625 < 0.66 → fail, unrounded.
		expect(circle).toMatchObject({ shape: 'circle', diameterUm: 250, areaRatio: 0.625, status: 'fail' });
		expect(circle.reasons[0]).toMatchObject({ limit: 'areaRatio', required: 0.66 });
		expect(polygon.verticesUm).toHaveLength(4);

		const one = await request.get(`/api/stencils/${stencil.id}`, { headers: bearer(tokenFor('quality')) });
		expect(one.status()).toBe(200);
		expect(await one.json()).toMatchObject({ id: stencil.id, apertureCount: 3, summary: { total: 3, failCount: 1 } });
		const list = await request.get('/api/stencils', { headers: bearer(tokenFor('technician')) });
		expect((await list.json()).stencils.map((s: { name: string }) => s.name)).toContain(name);
		expect((await request.get('/api/stencils/999999', { headers: engineer })).status()).toBe(404);
	});
});
