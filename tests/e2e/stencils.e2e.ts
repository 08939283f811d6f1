import { readFileSync } from 'node:fs';
import { expect, test, type Page } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

const FIXTURES = 'tests/fixtures/stencil';

/**
 * Where a stencil point (µm, y up) is on screen, through the canvas map's own transform
 * (`data-transform`: user units per CSS pixel, then the user point at the top-left corner).
 */
async function pointOnMap(page: Page, xUm: number, yUm: number): Promise<{ x: number; y: number }> {
	const layer = page.getByTestId('map-layer');
	await layer.scrollIntoViewIfNeeded();
	await expect(layer).toHaveAttribute('data-painted', /\d+/);
	return layer.evaluate(
		(c, [x, y]) => {
			const [scale, ox, oy] = (c.getAttribute('data-transform') ?? '').split(' ').map(Number);
			const r = c.getBoundingClientRect();
			return { x: r.left + (x - ox) / scale, y: r.top + (-y - oy) / scale };
		},
		[xUm, yUm]
	);
}

test.describe('stencil design check', () => {
	test('an engineer creates a stencil, imports a Gerber and a CSV, finds the failures and exports them', async ({
		page
	}) => {
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
		await expect(
			page.getByRole('region', { name: 'Aperture map' }).getByText('No apertures yet')
		).toBeVisible();

		// Gerber with a centroid file: 7 apertures, named U7, U1, C3, J2.
		const panel = page.getByTestId('import-form');
		await panel
			.getByLabel('Aperture file (CSV or Gerber)')
			.setInputFiles(`${FIXTURES}/paste-top.gbr`);
		await panel
			.getByLabel('Centroid CSV for Gerber (optional)')
			.setInputFiles(`${FIXTURES}/centroids.csv`);
		await panel.getByLabel('Centroid unit').selectOption('mm');
		await panel.getByRole('button', { name: 'Import apertures' }).click();
		await expect(page.getByTestId('import-done')).toContainText('Imported 7 apertures from GERBER');

		// A CSV with a bad cell is refused with its line and column; nothing is added.
		await panel
			.getByLabel('Aperture file (CSV or Gerber)')
			.setInputFiles(`${FIXTURES}/bad-apertures.csv`);
		await panel.getByLabel('CSV unit').selectOption('mm');
		await panel.getByRole('button', { name: 'Import apertures' }).click();
		await expect(page.getByTestId('import-errors')).toContainText(
			'line 3, width: must be a number (got "wide")'
		);

		await panel
			.getByLabel('Aperture file (CSV or Gerber)')
			.setInputFiles(`${FIXTURES}/apertures.csv`);
		await panel.getByLabel('CSV unit').selectOption('mm');
		await panel.getByRole('button', { name: 'Import apertures' }).click();
		await expect(page.getByTestId('import-done')).toContainText(
			'Imported 4 apertures from CSV; the stencil now holds 11'
		);

		// Failing at 127 µm: two 0.25 mm circles (0.49), two 1.0 × 0.2 mm pads (0.656), two 0201 pads (0.570).
		await expect(page.getByTestId('fail-count')).toHaveText('✕ 6 fail');
		// The canvas map draws one path per status; its data attributes say how many outlines each.
		const map = page.getByTestId('aperture-map');
		const canvas = page.getByTestId('map-layer');
		await expect(canvas).toHaveAttribute('data-fail-count', '6');
		await expect(canvas).toHaveAttribute('data-pass-count', '5');
		await expect(map).toContainText('Fail (hatched)');

		const table = page.getByTestId('aperture-table');
		await page.getByLabel('Status').selectOption('fail');
		await expect(page.getByTestId('aperture-count')).toHaveText('6 of 11 apertures');
		await expect(table.locator('tbody tr[data-status="fail"]')).toHaveCount(6);
		await expect(table.locator('tbody tr[data-status="pass"]')).toHaveCount(0);
		await expect(table).toContainText('U7.1');
		await page.getByLabel('Status').selectOption('all');

		// Hover over a failing aperture shows its figures; a click selects its row. The map draws
		// no element per aperture, so the pointer goes to the aperture's centre on screen.
		const stencilId = new URL(page.url()).pathname.split('/').pop();
		const { apertures } = await (
			await page.request.get(`/api/stencils/${stencilId}/apertures`)
		).json();
		const target = apertures.find(
			(a: { status: string; shape: string }) => a.status === 'fail' && a.shape !== 'polygon'
		);
		const onScreen = await pointOnMap(page, target.xUm, target.yUm);
		await page.mouse.move(onScreen.x, onScreen.y);
		await expect(map.getByRole('tooltip')).toContainText(`${target.refdes}.${target.pad}`);
		await expect(map.getByRole('tooltip')).toContainText('✕ fail');
		await expect(map.getByTestId('map-hovered')).toHaveCount(1);
		await page.mouse.click(onScreen.x, onScreen.y);
		const selected = table.locator('tbody tr[aria-selected="true"]');
		await expect(selected).toHaveCount(1);
		await expect(selected).toHaveAttribute('data-status', 'fail');
		await expect(selected).toHaveAttribute('id', `aperture-row-${target.id}`);
		await expect(map.getByTestId('map-selected')).toHaveCount(1);
		// Away from every aperture the tooltip goes; a click there selects nothing new.
		const box = (await map.locator('canvas[role="application"]').boundingBox())!;
		await page.mouse.move(box.x + 3, box.y + 3);
		await expect(map.getByRole('tooltip')).toHaveCount(0);
		// Zoom keeps the paths and moves only the view; the same aperture is still found.
		const viewBefore = await canvas.getAttribute('data-view');
		const drawnBefore = await canvas.getAttribute('data-transform');
		await canvas.focus();
		await page.keyboard.press('+');
		await expect(canvas).not.toHaveAttribute('data-view', viewBefore!);
		await expect(canvas).not.toHaveAttribute('data-transform', drawnBefore!);
		await expect(canvas).toHaveAttribute('data-fail-count', '6');
		await page.keyboard.press('0');
		await expect(canvas).toHaveAttribute('data-view', viewBefore!);

		const [download] = await Promise.all([
			page.waitForEvent('download'),
			page.getByTestId('export-csv').click()
		]);
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
		await page
			.getByRole('row')
			.filter({ hasText: 'Step stencil' })
			.getByRole('link', { name: 'ST-PB100' })
			.click();
		await expect(page.getByRole('heading', { level: 1 })).toContainText('rev B');
		await expect(page.getByTestId('revision-history')).toContainText('A');
		await page.getByLabel('Compare with another revision').selectOption({ label: 'rev A' });
		await page.getByRole('button', { name: 'Compare', exact: true }).click();
		await expect(page.getByRole('heading', { level: 1 })).toContainText('Rev A → rev B');
		// Demo rev B widens the 32 QFN pads of U1 from 220 to 250 µm; nothing else moves.
		await expect(page.getByTestId('compare-counts')).toContainText(/Changed\s*32/);
		await expect(page.getByRole('row').filter({ hasText: 'U1.1' }).first()).toContainText(
			'700 × 220 → 700 × 250'
		);

		await page.goto('/stencils/thresholds');
		const area = page.getByLabel('Minimum area ratio, Electroformed');
		await expect(area).toHaveValue('0.66');
		await area.fill('0');
		await page.getByRole('button', { name: 'Save thresholds' }).click();
		await expect(page.getByRole('alert')).toContainText('nothing was saved');
		await expect(page.locator('#electroformed-minAreaRatio-error')).toContainText('greater than 0');
		await area.fill('0.55');
		await page.getByRole('button', { name: 'Save thresholds' }).click();
		await expect(page.getByRole('status').filter({ hasText: 'Thresholds saved' })).toBeVisible();
		await page.reload();
		await expect(page.getByLabel('Minimum area ratio, Electroformed')).toHaveValue('0.55');
		await page.getByLabel('Minimum area ratio, Electroformed').fill('0.66');
		await page.getByRole('button', { name: 'Save thresholds' }).click();
		await expect(page.getByRole('status').filter({ hasText: 'Thresholds saved' })).toBeVisible();
	});

	test('API contract: create, import JSON, read figures; bad CSV names row and column and stores nothing', async ({
		request,
		baseURL
	}) => {
		const engineer = bearer(tokenFor('engineer'));
		const name = `ST-API-${Date.now() % 1_000_000}`;
		const created = await request.post('/api/stencils', {
			headers: engineer,
			data: { name, revision: 'A', thicknessUm: 100, technology: 'laser-stainless' }
		});
		expect(created.status()).toBe(201);
		const stencil = await created.json();
		expect(stencil).toMatchObject({
			name,
			revision: 'A',
			thicknessUm: 100,
			technology: 'laser-stainless',
			apertureCount: 0
		});
		expect(Number.isInteger(stencil.id)).toBe(true);

		const again = await request.post('/api/stencils', {
			headers: engineer,
			data: { name, revision: 'A', thicknessUm: 100, technology: 'laser-stainless' }
		});
		expect(again.status()).toBe(409);

		const badBody = await request.post('/api/stencils', {
			headers: engineer,
			data: { name: '', thicknessUm: -1 }
		});
		expect(badBody.status()).toBe(400);

		const url = `/api/stencils/${stencil.id}/apertures`;
		const imported = await request.post(url, {
			headers: engineer,
			data: {
				apertures: [
					{
						refdes: 'U1',
						pad: '1',
						shape: 'rectangle',
						lengthUm: 1000,
						widthUm: 200,
						xUm: 0,
						yUm: 0
					},
					{ refdes: 'U7', pad: 'A1', shape: 'circle', diameterUm: 250, xUm: 2000, yUm: 0 },
					{
						refdes: 'Q1',
						pad: '3',
						shape: 'polygon',
						verticesUm: [
							[-500, -300],
							[500, -300],
							[500, 300],
							[-500, 300]
						]
					}
				]
			}
		});
		expect(imported.status()).toBe(201);
		expect(await imported.json()).toMatchObject({
			count: 3,
			totalApertures: 3,
			source: 'json',
			mode: 'append',
			warnings: []
		});

		const badJson = await request.post(url, {
			headers: engineer,
			data: {
				apertures: [
					{
						refdes: 'U2',
						pad: '1',
						shape: 'rectangle',
						lengthUm: 300,
						widthUm: 200,
						cornerRadiusUm: 150
					}
				]
			}
		});
		expect(badJson.status()).toBe(400);
		expect((await badJson.json()).fields.map((f: { field: string }) => f.field)).toContain(
			'apertures[0].cornerRadiusUm'
		);

		// Browsers send an Origin header with multipart posts; SvelteKit refuses form posts without one.
		const badCsv = await request.post(url, {
			headers: { ...engineer, origin: new URL(url, baseURL).origin },
			multipart: {
				file: {
					name: 'bad-apertures.csv',
					mimeType: 'text/csv',
					buffer: readFileSync(`${FIXTURES}/bad-apertures.csv`)
				},
				unit: 'mm'
			}
		});
		expect(badCsv.status()).toBe(422);
		const refusal = await badCsv.json();
		expect(refusal.error).toContain('nothing was imported');
		expect(refusal.errors).toEqual([
			{
				file: 'bad-apertures.csv',
				line: 3,
				column: 'width',
				message: 'line 3, width: must be a number (got "wide")'
			}
		]);

		// Scripts can send the file as the raw body instead, with options in the query string.
		const rawBad = await request.post(`${url}?unit=mm&fileName=bad.csv`, {
			headers: { ...engineer, 'content-type': 'text/csv' },
			data: readFileSync(`${FIXTURES}/bad-apertures.csv`)
		});
		expect(rawBad.status()).toBe(422);
		expect((await rawBad.json()).errors[0]).toMatchObject({
			file: 'bad.csv',
			line: 3,
			column: 'width'
		});
		const rawGerber = await request.post(`${url}?fileName=paste-top.gbr&mode=replace`, {
			headers: { ...engineer, 'content-type': 'application/octet-stream' },
			data: readFileSync(`${FIXTURES}/paste-top.gbr`)
		});
		expect(rawGerber.status()).toBe(201);
		expect(await rawGerber.json()).toMatchObject({
			source: 'gerber',
			unit: 'mm',
			mode: 'replace',
			count: 7,
			totalApertures: 7
		});
		// Put the three JSON apertures back for the checks below.
		expect(
			(
				await request.post(url, {
					headers: engineer,
					data: {
						mode: 'replace',
						apertures: [
							{
								refdes: 'U1',
								pad: '1',
								shape: 'rectangle',
								lengthUm: 1000,
								widthUm: 200,
								xUm: 0,
								yUm: 0
							},
							{ refdes: 'U7', pad: 'A1', shape: 'circle', diameterUm: 250, xUm: 2000, yUm: 0 },
							{
								refdes: 'Q1',
								pad: '3',
								shape: 'polygon',
								verticesUm: [
									[-500, -300],
									[500, -300],
									[500, 300],
									[-500, 300]
								]
							}
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
			for (const field of [
				'thicknessUm',
				'areaUm2',
				'perimeterUm',
				'areaRatio',
				'aspectRatio',
				'volumeUm3',
				'status',
				'reasons'
			])
				expect(a, field).toHaveProperty(field);
		// 0.2 × 1.0 mm at 100 µm: AR 200000 / (2400 × 100), aspect 2.0, volume 2e7 µm³ (worked-examples.json).
		expect(rect).toMatchObject({
			refdes: 'U1',
			pad: '1',
			shape: 'rectangle',
			lengthUm: 1000,
			widthUm: 200,
			thicknessUm: 100,
			areaUm2: 200000,
			perimeterUm: 2400,
			aspectRatio: 2,
			volumeUm3: 20000000,
			status: 'pass',
			reasons: []
		});
		expect(rect.areaRatio).toBeCloseTo(0.8333333333333334, 15);
		// Circle: AR = D / 4T = 250 / 400 = 0.625 < 0.66 → fail, unrounded.
		expect(circle).toMatchObject({
			shape: 'circle',
			diameterUm: 250,
			areaRatio: 0.625,
			status: 'fail'
		});
		expect(circle.reasons[0]).toMatchObject({ limit: 'areaRatio', required: 0.66 });
		expect(polygon.verticesUm).toHaveLength(4);

		const one = await request.get(`/api/stencils/${stencil.id}`, {
			headers: bearer(tokenFor('quality'))
		});
		expect(one.status()).toBe(200);
		expect(await one.json()).toMatchObject({
			id: stencil.id,
			apertureCount: 3,
			summary: { total: 3, failCount: 1 }
		});
		const list = await request.get('/api/stencils', { headers: bearer(tokenFor('technician')) });
		expect((await list.json()).stencils.map((s: { name: string }) => s.name)).toContain(name);
		expect((await request.get('/api/stencils/999999', { headers: engineer })).status()).toBe(404);
	});

	test('an engineer types in an aperture, a bad one is refused beside its field, and removes one', async ({
		page,
		request
	}) => {
		const name = `ST-FORM-${Date.now() % 1_000_000}`;
		const created = await request.post('/api/stencils', {
			headers: bearer(tokenFor('engineer')),
			data: { name, revision: 'A', thicknessUm: 127, technology: 'laser-stainless' }
		});
		expect(created.status()).toBe(201);
		const { id } = await created.json();
		await signInAs(page, 'engineer');
		await page.goto(`/stencils/${id}`);
		await expect(
			page.getByRole('region', { name: 'Aperture map' }).getByText('No apertures yet')
		).toBeVisible();

		const form = page.locator('form[action="?/addAperture"]');
		await form.getByLabel('Refdes').fill('R1');
		await form.getByLabel('Pad').fill('1');
		await form.getByLabel('Shape').selectOption('rectangle');
		await form.getByLabel('Length (µm)').fill('300');
		await form.getByLabel('Width (µm)').fill('280');
		await form.getByLabel('x (µm)').fill('1000');
		await form.getByLabel('y (µm)').fill('2000');
		await form.getByRole('button', { name: 'Add aperture' }).click();
		await expect(form.getByRole('status')).toContainText('Aperture R1.1 added.');
		// 0201 pad 300 × 280 µm at 127 µm: AR = 84000 / (1160 × 127) = 0.570 < 0.66 (first principles).
		await expect(page.getByTestId('fail-count')).toHaveText('✕ 1 fail');
		const table = page.getByTestId('aperture-table');
		await expect(table.locator('tbody tr[data-status="fail"]')).toHaveCount(1);
		await expect(table).toContainText('R1.1');
		await expect(page.getByTestId('map-layer')).toHaveAttribute('data-fail-count', '1');

		// A corner radius above half the width is refused beside its field; nothing is added.
		await form.getByLabel('Refdes').fill('R2');
		await form.getByLabel('Shape').selectOption('rounded-rectangle');
		await form.getByLabel('Length (µm)').fill('300');
		await form.getByLabel('Width (µm)').fill('200');
		await form.getByLabel('Corner radius (µm)').fill('150');
		await form.getByRole('button', { name: 'Add aperture' }).click();
		await expect(form.locator('#field-cornerRadiusUm-error')).toContainText(
			'150 µm exceeds half the smaller side (100 µm)'
		);
		await expect(form.getByLabel('Corner radius (µm)')).toHaveAttribute('aria-invalid', 'true');
		await expect(page.getByTestId('aperture-count')).toHaveText('1 of 1 apertures');
		const stored = await (await page.request.get(`/api/stencils/${id}/apertures`)).json();
		expect(stored.apertures.map((a: { refdes: string }) => a.refdes)).toEqual(['R1']);

		await table.getByRole('button', { name: 'Remove R1.1' }).click();
		await expect(page.getByRole('status').filter({ hasText: 'Aperture removed.' })).toBeVisible();
		await expect(
			page.getByRole('region', { name: 'Aperture map' }).getByText('No apertures yet')
		).toBeVisible();
		expect(
			(await (await page.request.get(`/api/stencils/${id}/apertures`)).json()).apertures
		).toEqual([]);
	});

	test('site thresholds through the API: every role reads, engineers change them, bad values are named', async ({
		request
	}) => {
		const url = '/api/stencil-thresholds';
		const engineer = bearer(tokenFor('engineer'));
		const read = await request.get(url, { headers: bearer(tokenFor('viewer')) });
		expect(read.status()).toBe(200);
		const before = await read.json();
		// IPC-7525 guideline defaults: area ratio 0.66, aspect ratio 1.5.
		expect(before.defaults.electroformed).toEqual({ minAreaRatio: 0.66, minAspectRatio: 1.5 });
		expect(Object.keys(before.thresholds).sort()).toEqual([
			'electroformed',
			'laser-nano-coated',
			'laser-stainless',
			'step'
		]);

		for (const role of ['viewer', 'technician', 'quality'] as const) {
			const refused = await request.put(url, {
				headers: bearer(tokenFor(role)),
				data: { thresholds: { electroformed: { minAreaRatio: 0.5 } } }
			});
			expect(refused.status(), role).toBe(403);
		}

		const bad = await request.put(url, {
			headers: engineer,
			data: {
				thresholds: {
					electroformed: { minAreaRatio: 0, minAspectRatio: 1.5 },
					plastic: { minAreaRatio: 0.5 }
				}
			}
		});
		expect(bad.status()).toBe(422);
		const refusal = await bad.json();
		expect(refusal.errors).toEqual([
			{ field: 'thresholds.plastic', message: expect.stringContaining('unknown technology') },
			{ field: 'thresholds.electroformed.minAreaRatio', message: 'must be greater than 0' }
		]);
		expect(
			(
				await request.put(url, {
					headers: { ...engineer, 'content-type': 'application/json' },
					data: Buffer.from('not json')
				})
			).status()
		).toBe(400);
		expect((await (await request.get(url, { headers: engineer })).json()).thresholds).toEqual(
			before.thresholds
		);

		// An electroformed stencil with a 0201 pad at 127 µm: AR = 84000 / (1160 × 127) = 0.570 (first principles).
		const stencil = await (
			await request.post('/api/stencils', {
				headers: engineer,
				data: {
					name: `ST-THR-${Date.now() % 1_000_000}`,
					revision: 'A',
					thicknessUm: 127,
					technology: 'electroformed'
				}
			})
		).json();
		const apertures = `/api/stencils/${stencil.id}/apertures`;
		await request.post(apertures, {
			headers: engineer,
			data: {
				apertures: [{ refdes: 'R1', pad: '1', shape: 'rectangle', lengthUm: 300, widthUm: 280 }]
			}
		});
		const status = async () =>
			(await (await request.get(apertures, { headers: engineer })).json()).apertures[0].status;
		expect(await status()).toBe('fail');

		const saved = await request.put(url, {
			headers: engineer,
			data: { thresholds: { electroformed: { minAreaRatio: 0.55 } } }
		});
		expect(saved.status()).toBe(200);
		const after = (await saved.json()).thresholds;
		expect(after.electroformed).toEqual({ minAreaRatio: 0.55, minAspectRatio: 1.5 });
		expect(after['laser-stainless']).toEqual(before.thresholds['laser-stainless']);
		expect(await status()).toBe('pass');

		const restored = await request.put(url, {
			headers: bearer(tokenFor('admin')),
			data: { thresholds: { electroformed: before.thresholds.electroformed } }
		});
		expect(restored.status()).toBe(200);
		expect(await status()).toBe('fail');
	});
});
