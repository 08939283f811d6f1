import { expect, test } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

test.describe('analysis API', () => {
	test('transfer efficiency: the demo learns an area-ratio limit; bad fields are named', async ({
		request
	}) => {
		const viewer = bearer(tokenFor('viewer'));
		const res = await request.get(
			'/api/analysis/transfer-efficiency?technology=laser-stainless&powder=4&floor=0.7',
			{ headers: viewer }
		);
		expect(res.status()).toBe(200);
		const body = await res.json();
		expect(body.n).toBeGreaterThan(10_000);
		expect(body.floor).toBe(0.7);
		expect(body.bins.length).toBeGreaterThan(10);
		for (const key of ['areaRatio', 'teMean', 'teP10', 'teP90', 'n'])
			expect(body.bins[0]).toHaveProperty(key);
		expect(body.fit.model).toBe('logistic-4');
		expect(Object.keys(body.fit.coefficients).sort()).toEqual(['knee', 'lower', 'scale', 'upper']);
		expect(body.fit.band[0]).toHaveProperty('lower');
		expect(body.learnedMinAreaRatio).toBeGreaterThan(0.55);
		expect(body.learnedMinAreaRatio).toBeLessThan(0.7);

		const none = await (
			await request.get('/api/analysis/transfer-efficiency?technology=electroformed', {
				headers: viewer
			})
		).json();
		expect(none.learnedMinAreaRatio).toBeNull();
		expect(none.reason).toMatch(/too few area-ratio bins/);

		const bad = await request.get(
			'/api/analysis/transfer-efficiency?floor=abc&powder=12&from=2026-13-01&colour=red',
			{ headers: viewer }
		);
		expect(bad.status()).toBe(400);
		const fields = (await bad.json()).fields.map((f: { field: string }) => f.field).sort();
		expect(fields).toEqual(['colour', 'floor', 'from', 'powder']);
		expect((await request.get('/api/analysis/transfer-efficiency')).status()).toBe(401);
	});

	test('parameters: one point per run with r, its interval and the caution', async ({
		request
	}) => {
		const viewer = bearer(tokenFor('viewer'));
		const body = await (
			await request.get(
				'/api/analysis/parameters?parameter=squeegeeSpeedMmS&outcome=volumeMean&product=SH-220&line=SMT-2',
				{ headers: viewer }
			)
		).json();
		expect(body.n).toBe(24);
		expect(body.points).toHaveLength(24);
		expect(body.correlation.n).toBe(24);
		expect(body.correlation.lower).toBeLessThan(body.correlation.r);
		expect(body.correlation.upper).toBeGreaterThan(body.correlation.r);
		expect(body.fit.band.length).toBeGreaterThan(2);
		expect(body.caution).toMatch(/not a cause/);
		const bad = await request.get('/api/analysis/parameters?outcome=volumeMean', {
			headers: viewer
		});
		expect(bad.status()).toBe(400);
		expect((await bad.json()).fields[0].field).toBe('parameter');
	});

	test('trace: exact serial, prefix, nothing; serial required', async ({ request }) => {
		const viewer = bearer(tokenFor('viewer'));
		const exact = await (
			await request.get('/api/trace?serial=FW-SH220-0000001', { headers: viewer })
		).json();
		expect(exact.match).toBe('exact');
		const b = exact.boards[0];
		expect(b.stencil.name).toBe('ST-SH220');
		expect(b.pasteLot.lotNumber).toBe('PL-2026-0390');
		expect(b.operator.name).toBe('Cleo Marrowby');
		expect(b.recipe.version).toBeGreaterThanOrEqual(1);
		const prefix = await (
			await request.get('/api/trace?serial=FW-SH220-000002', { headers: viewer })
		).json();
		expect(prefix.match).toBe('prefix');
		expect(prefix.boards).toHaveLength(10);
		const none = await (
			await request.get('/api/trace?serial=ZZ-NOTHING', { headers: viewer })
		).json();
		expect(none.match).toBe('none');
		expect((await request.get('/api/trace', { headers: viewer })).status()).toBe(400);
	});
});

test('stencil evidence: wear against prints and predicted TE per aperture; 404 and 400', async ({
	request
}) => {
	const viewer = bearer(tokenFor('viewer'));
	const stencils = (await (await request.get('/api/stencils', { headers: viewer })).json())
		.stencils as {
		id: number;
		name: string;
	}[];
	const id = stencils.find((s) => s.name === 'ST-SH220')!.id;
	const wear = await (
		await request.get(`/api/analysis/stencil-wear?stencil=${id}`, { headers: viewer })
	).json();
	expect(wear.points).toHaveLength(24);
	expect(wear.points[1].printsBefore).toBe(12);
	expect(typeof wear.flagged).toBe('boolean');
	expect(wear.sinceWipe[0].printsSinceWipe).toBe(1);
	expect(wear.sinceWipe.reduce((n: number, g: { boards: number }) => n + g.boards, 0)).toBe(288);
	const predicted = await (
		await request.get(`/api/analysis/predicted-te?stencil=${id}&floor=0.7`, { headers: viewer })
	).json();
	expect(predicted.apertures).toBe(305);
	expect(predicted.belowFloor).toBeGreaterThan(0);
	expect(predicted.listed[0].predictedTe).toBeLessThan(0.7);
	expect(
		(await request.get('/api/analysis/predicted-te?stencil=999999', { headers: viewer })).status()
	).toBe(404);
	expect(
		(await request.get('/api/analysis/stencil-wear?stencil=x', { headers: viewer })).status()
	).toBe(400);
});

test('first-pass yield by line; an unknown grouping is named', async ({ request }) => {
	const viewer = bearer(tokenFor('viewer'));
	const body = await (
		await request.get('/api/analysis/yield?by=line&product=SH-220', { headers: viewer })
	).json();
	expect(body.groups.map((g: { key: string }) => g.key)).toEqual(['SMT-2']);
	expect(body.total.boards).toBe(288);
	const bad = await request.get('/api/analysis/yield?by=shift', { headers: viewer });
	expect(bad.status()).toBe(400);
	expect((await bad.json()).fields[0].field).toBe('by');
});

test('failure map: every SH-220 pad placed, Pareto by pad class', async ({ request }) => {
	const viewer = bearer(tokenFor('viewer'));
	const m = await (
		await request.get('/api/analysis/failure-map?product=SH-220', { headers: viewer })
	).json();
	expect(m.boards).toBe(288);
	expect(m.pads).toHaveLength(305);
	expect(m.pads.every((p: { xUm: number | null }) => p.xUm !== null)).toBe(true);
	// The small openings (wafer-level packages, U) fail most in the demo.
	expect(m.byClass[0].padClass).toBe('U');
	expect((await request.get('/api/analysis/failure-map', { headers: viewer })).status()).toBe(400);
});

test.describe('analysis pages', () => {
	test('the TE chart with its learned limit, and the parameter scatter with its caution', async ({
		page
	}) => {
		await signInAs(page, 'viewer');
		await page.goto('/analysis');
		// It opens on the most printed technology (laser-stainless in the demo) with a limit.
		await expect(page.getByLabel('Stencil technology')).toHaveValue('laser-stainless');
		await expect(page.getByTestId('te-learned')).toHaveText(/^0\.\d{3}$/);
		await page.getByLabel('Stencil technology').selectOption('laser-stainless');
		await page.getByLabel('Powder type').selectOption('4');
		await expect(page.getByTestId('te-learned')).toHaveText(/^0\.\d{3}$/);
		await expect(page.getByTestId('te-chart').locator('svg').first()).toBeVisible();
		await expect(page.getByTestId('te-fit')).toContainText('exp(');
		await page.getByLabel('Stencil technology').selectOption('electroformed');
		await expect(page.getByTestId('te-reason')).toContainText('too few area-ratio bins');

		await page.getByLabel('Product').selectOption('SH-220');
		await expect(page.getByTestId('pa-summary')).toContainText('24 runs');
		await expect(page.getByTestId('pa-summary')).toContainText('95 % CI');
		await expect(page.getByTestId('pa-caution')).toContainText('not a cause');
		await expect(page.getByTestId('scatter-chart').locator('svg').first()).toBeVisible();
		await expect(page.getByTestId('wear-summary')).toContainText('24 runs');
		await expect(page.getByTestId('predicted-summary')).toContainText('predicted below the floor');
		await expect(page.getByTestId('failure-map').locator('circle')).toHaveCount(305);
		await expect(
			page.getByTestId('class-pareto').locator('tbody tr').first().locator('td').first()
		).toHaveText('U');
		// The CSV of the TE bins is the table's figures, one row per bin.
		await page.getByLabel('Stencil technology').selectOption('laser-stainless');
		await expect(page.getByTestId('te-learned')).toHaveText(/^0\.\d{3}$/);
		await page.getByText('Bins', { exact: true }).click();
		const download = page.waitForEvent('download');
		await page
			.getByTestId('te-bins')
			.locator('xpath=..')
			.getByRole('button', { name: 'CSV' })
			.click();
		const csv = await (await download).createReadStream().then(async (stream) => {
			let text = '';
			for await (const chunk of stream) text += chunk;
			return text;
		});
		expect(csv.split('\r\n')[0]).toBe('area_ratio,te_mean,te_p10,te_p90,pads,left_out');
		expect(csv.trim().split('\r\n').length).toBeGreaterThan(10);
		await page.getByLabel('Group by').selectOption('product');
		await expect(
			page.getByTestId('yield-table').locator('tbody tr', { hasText: 'SH-220' })
		).toHaveCount(1);
	});

	test('board trace page', async ({ page }) => {
		await signInAs(page, 'quality');
		await page.goto('/trace');
		await page.getByLabel('Board serial').fill('FW-SH220-0000001');
		await page.getByRole('button', { name: 'Trace' }).click();
		await expect(page.getByTestId('trace-match')).toContainText('Exact serial');
		await expect(page.getByTestId('trace-stencil')).toContainText('ST-SH220 rev A');
		await expect(page.getByTestId('trace-lot')).toContainText('PL-2026-0390');
		await expect(page.getByTestId('trace-operator')).toHaveText('Cleo Marrowby');
	});

	test('an engineer adopts the learned limit (audited); a viewer has no button and is refused', async ({
		page,
		browser,
		request
	}) => {
		const engineerApi = bearer(tokenFor('engineer'));
		const before = (
			await (await request.get('/api/stencil-thresholds', { headers: engineerApi })).json()
		).thresholds;
		try {
			await signInAs(page, 'engineer');
			await page.goto('/analysis');
			await expect(page.getByLabel('Stencil technology')).toHaveValue('laser-stainless');
			const button = page.getByRole('button', {
				name: /^Adopt 0\.\d\d as the laser-stainless minimum$/
			});
			await expect(button).toBeVisible();
			const value = Number(/Adopt (0\.\d\d)/.exec((await button.textContent()) ?? '')![1]);
			await button.click();
			await expect(page.getByTestId('te-adopted')).toContainText(
				`minimum area ratio ${value.toFixed(2)}`
			);
			const after = (
				await (await request.get('/api/stencil-thresholds', { headers: engineerApi })).json()
			).thresholds;
			expect(after['laser-stainless'].minAreaRatio).toBe(value);
			await expect(page.getByTestId('te-site-limit')).toContainText(value.toFixed(2));
			const audit = await (
				await request.get('/api/audit?kind=setting', { headers: bearer(tokenFor('quality')) })
			).json();
			expect(audit.entries[0].after['laser-stainless'].minAreaRatio).toBe(value);
		} finally {
			// Other specs read the demo thresholds: put them back.
			await request.put('/api/stencil-thresholds', {
				headers: engineerApi,
				data: { thresholds: before }
			});
		}
		const viewer = await browser.newPage();
		await signInAs(viewer, 'viewer');
		await viewer.goto('/analysis');
		await expect(viewer.getByTestId('te-learned')).toHaveText(/^0\.\d{3}$/);
		await expect(viewer.getByRole('button', { name: /^Adopt/ })).toHaveCount(0);
		const refused = await viewer.request.post('/analysis?/adopt', {
			form: { technology: 'laser-stainless' },
			headers: { origin: new URL(viewer.url()).origin }
		});
		expect(refused.status()).toBe(403);
		await viewer.close();
	});

	test('print-ready run report and weekly line report', async ({ page, request }) => {
		const viewer = bearer(tokenFor('viewer'));
		const trace = await (
			await request.get('/api/trace?serial=FW-SH220-0000001', { headers: viewer })
		).json();
		const runId = trace.boards[0].run.id;
		await signInAs(page, 'viewer');
		await page.goto(`/analysis/reports/runs/${runId}`);
		await expect(page.getByRole('heading', { level: 1 })).toHaveText(
			`Print run ${runId}: SH-220 on SMT-2`
		);
		await expect(page.getByTestId('report-stencil')).toContainText('ST-SH220 rev A');
		await expect(page.getByTestId('report-parameters')).toContainText('squeegeeSpeedMmS');
		await expect(page.getByTestId('report-parameters')).toContainText('25–80 (target 50)');
		await expect(page.getByTestId('report-outcome')).toContainText('12');
		await expect(page.getByTestId('report-failing').locator('tbody tr').first()).toBeVisible();
		await expect(page.getByRole('button', { name: 'Print or save as PDF' })).toBeVisible();
		expect((await page.goto('/analysis/reports/runs/999999'))?.status()).toBe(404);

		// The analysis page's form leads to the weekly report.
		await page.goto('/analysis');
		await page.locator('#rp-line').selectOption('SMT-2');
		await page.getByRole('button', { name: 'Weekly line report' }).click();
		await expect(page).toHaveURL(/\/analysis\/reports\/line-week\?line=SMT-2&week=\d{4}-W\d{2}$/);
		const week = new Date(trace.boards[0].run.startedAt);
		// The ISO week of the first SH-220 run, computed here independently of the server.
		const thursday = new Date(
			Date.UTC(
				week.getUTCFullYear(),
				week.getUTCMonth(),
				week.getUTCDate() + 3 - ((week.getUTCDay() + 6) % 7)
			)
		);
		const n = Math.ceil(
			((thursday.getTime() - Date.UTC(thursday.getUTCFullYear(), 0, 1)) / 86_400_000 + 1) / 7
		);
		const isoWeek = `${thursday.getUTCFullYear()}-W${String(n).padStart(2, '0')}`;
		await page.goto(`/analysis/reports/line-week?line=SMT-2&week=${isoWeek}`);
		await expect(page.getByRole('heading', { level: 1 })).toHaveText(`SMT-2, week ${isoWeek}`);
		await expect(
			page.getByTestId('week-runs').locator('tbody tr', { hasText: `run ${runId}` })
		).toHaveCount(1);
		expect(
			(await page.goto('/analysis/reports/line-week?line=SMT-2&week=2026-W60'))?.status()
		).toBe(400);
	});
});
