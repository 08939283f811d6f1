import { expect, test } from '@playwright/test';
import { readFileSync } from 'node:fs';
import { bearer, signInAs, tokenFor } from './helpers';

// NIST/SEMATECH e-Handbook §6.3.2.2 individuals example, with its published limits.
const examples = JSON.parse(readFileSync('reference/spc/worked-examples.json', 'utf8'));
const nist = examples.nistIndividualsFlowRate as {
	values: number[];
	ucl: number;
	lcl: number;
	mean: number;
};

test.describe('ad-hoc study', () => {
	test('POST /api/spc/analyze gives the published NIST limits; bad input is 422 by field', async ({
		request
	}) => {
		const ok = await request.post('/api/spc/analyze', {
			headers: bearer(tokenFor('viewer')),
			data: { chart: 'i-mr', values: nist.values, lsl: 40, usl: 60, rules: ['we-1', 'nelson-3'] }
		});
		expect(ok.status()).toBe(200);
		const body = await ok.json();
		expect(body.limits.location.cl).toBeCloseTo(nist.mean, 6);
		expect(body.limits.location.ucl).toBeCloseTo(nist.ucl, 2);
		expect(body.limits.location.lcl).toBeCloseTo(nist.lcl, 2);
		expect(body.capability).toMatchObject({
			cp: expect.any(Number),
			cpk: expect.any(Number),
			pp: expect.any(Number)
		});
		expect(body.violations).toEqual([]);

		const oneSided = await request.post('/api/spc/analyze', {
			headers: bearer(tokenFor('viewer')),
			data: { chart: 'i-mr', values: nist.values, usl: 60 }
		});
		expect((await oneSided.json()).capability.cp).toBeNull();

		for (const [data, field] of [
			[{ chart: 'xbar-r', subgroups: [[1], [2]] }, 'subgroups[0]'],
			[
				{
					chart: 'xbar-r',
					subgroups: [
						[1, 2],
						[3, 4, 5]
					]
				},
				'subgroups[1]'
			],
			[{ chart: 'i-mr', values: [1, 'x', 3] }, 'values[1]'],
			[{ chart: 'i-mr', values: [1, 2, 3], lsl: 5, usl: 1 }, 'lsl'],
			[{ chart: 'i-mr', values: [4, 4, 4] }, 'values'],
			[{ chart: 'p-chart', values: [1, 2] }, 'chart']
		] as const) {
			const bad = await request.post('/api/spc/analyze', {
				headers: bearer(tokenFor('viewer')),
				data
			});
			expect(bad.status(), JSON.stringify(data)).toBe(422);
			const { errors } = await bad.json();
			expect(
				errors.map((e: { field: string }) => e.field),
				JSON.stringify(data)
			).toContain(field);
		}
	});

	test('the study page charts pasted numbers with the same limits and capability', async ({
		page
	}) => {
		await signInAs(page, 'viewer');
		await page.goto('/study');
		await page.getByLabel('Chart').selectOption('i-mr');
		await page.getByLabel('Data', { exact: true }).fill(nist.values.join('\n'));
		await page.getByLabel('LSL').fill('40');
		await page.getByLabel('USL').fill('60');
		await page.getByRole('button', { name: 'Analyse' }).click();
		const location = page.getByTestId('location-pane');
		await expect(location).toContainText('UCL 55.80');
		await expect(location).toContainText('LCL 45.82');
		await expect(page.getByTestId('no-signals')).toBeVisible();
		await expect(page.getByTestId('capability-reading')).toBeVisible();

		await page.getByLabel('Data', { exact: true }).fill('1 2\n3 x');
		await page.getByRole('button', { name: 'Analyse' }).click();
		await expect(page.getByText('line 2, column 2: "x" is not a number')).toBeVisible();
	});

	test('between/within through the API matches the hand-computed example; NaN and mixed sizes are named', async ({
		request
	}) => {
		const bw = JSON.parse(
			readFileSync('reference/spc/between-within-example.json', 'utf8')
		).rangeExample;
		const viewer = bearer(tokenFor('viewer'));
		const res = await request.post('/api/spc/analyze', {
			headers: viewer,
			data: { chart: 'between-within', subgroups: bw.subgroups, ...bw.specs }
		});
		expect(res.status()).toBe(200);
		const body = await res.json();
		for (const part of ['location', 'movingRange', 'dispersion'] as const) {
			for (const key of ['lcl', 'cl', 'ucl'] as const) {
				expect(
					Math.abs(body.limits[part][key] - bw.expected[part][key]),
					`${part}.${key}`
				).toBeLessThan(1e-5);
			}
		}
		expect(Math.abs(body.capability.cpk - bw.expected.cpk)).toBeLessThan(1e-5);
		expect(Math.abs(body.capability.ppk - bw.expected.ppk)).toBeLessThan(1e-5);

		const nan = await request.post('/api/spc/analyze', {
			headers: { ...viewer, 'content-type': 'application/json' },
			data: Buffer.from('{"chart":"i-mr","values":[1,NaN,3]}')
		});
		expect(nan.status()).toBe(400);
		expect((await nan.json()).error).toMatch(/NaN at character 29 is not a JSON number/);

		const mixed = await request.post('/api/spc/analyze', {
			headers: viewer,
			data: {
				chart: 'xbar-r',
				subgroups: [
					[1, 2, 3],
					[2, 3, 4],
					[5, 6],
					[7, 8, 9]
				]
			}
		});
		expect(mixed.status()).toBe(422);
		expect(await mixed.json()).toEqual({
			errors: [
				{
					field: 'subgroups[2]',
					message: 'has 2 values but subgroup 0 has 3; X-bar/R needs equal subgroup sizes'
				}
			]
		});
	});

	test('the study page draws a between/within chart and names a subgroup of another size', async ({
		page
	}) => {
		const bw = JSON.parse(
			readFileSync('reference/spc/between-within-example.json', 'utf8')
		).rangeExample;
		await signInAs(page, 'viewer');
		await page.goto('/study');
		await page.getByLabel('Chart').selectOption('between-within');
		await page
			.getByLabel('Data', { exact: true })
			.fill(bw.subgroups.map((g: number[]) => g.join(' ')).join('\n'));
		await page.getByRole('button', { name: 'Analyse' }).click();
		// Hand-computed: 11.6 ± 3·1.5/d2(2); MR UCL D4(2)·1.5; R chart D4(5)·2.6 (2 decimals shown)
		await expect(page.getByTestId('location-pane')).toContainText(
			'UCL 15.59 · CL 11.60 · LCL 7.61'
		);
		await expect(page.getByTestId('mr-pane')).toContainText('UCL 4.90 · CL 1.50 · LCL 0.00');
		await expect(page.getByTestId('dispersion-pane')).toContainText(
			'UCL 5.50 · CL 2.60 · LCL 0.00'
		);

		await page.getByLabel('Chart').selectOption('xbar-s');
		await page.getByLabel('Data', { exact: true }).fill('1 2 3\n2 3 4\n5 6');
		await page.getByRole('button', { name: 'Analyse' }).click();
		await expect(
			page.getByText(
				'line 3 (subgroups[2]): has 2 values but subgroup 0 has 3; X-bar/S needs equal subgroup sizes'
			)
		).toBeVisible();
	});
});

test.describe('charts and signals on demo data', () => {
	test('the API lists charts worst first and gives points, limits and violations', async ({
		request
	}) => {
		const list = await request.get('/api/charts', { headers: bearer(tokenFor('viewer')) });
		expect(list.status()).toBe(200);
		const { charts } = await list.json();
		const speed = charts.find(
			(c: { name: string }) => c.name === 'Squeegee speed · PB-100 · SMT-1'
		);
		expect(speed).toMatchObject({ phase: 'II', limitsVersion: 1 });
		expect(speed.openSignals).toBeGreaterThan(0);
		expect(charts[0].openSignals).toBeGreaterThanOrEqual(speed.openSignals);

		const one = await request.get(`/api/charts/${speed.id}`, {
			headers: bearer(tokenFor('viewer'))
		});
		const chart = await one.json();
		expect(chart.points.length).toBeGreaterThan(10);
		expect(chart.limits.location.ucl).toBeGreaterThan(chart.limits.location.cl);
		const hit = chart.violations.find(
			(v: { rule: string; chart: string }) => v.rule === 'we-1' && v.chart === 'location'
		);
		expect(chart.points[hit.index].location).toBe(65);
		expect(
			(await request.get('/api/charts/999999', { headers: bearer(tokenFor('viewer')) })).status()
		).toBe(404);
	});

	test('a quality engineer acknowledges the signal; the follower had one mail', async ({
		page,
		request
	}) => {
		const open = await (
			await request.get('/api/signals?status=open', { headers: bearer(tokenFor('viewer')) })
		).json();
		const signal = open.signals.find(
			(s: { value: number; rule: string }) => s.rule === 'we-1' && s.value === 65
		);
		expect(signal).toBeTruthy();

		const viewer = await request.post(`/api/signals/${signal.id}/acknowledge`, {
			headers: bearer(tokenFor('viewer')),
			data: { cause: 'Squeegee pressure drift', action: 'Adjust pressure' }
		});
		expect(viewer.status()).toBe(403);
		const unlisted = await request.post(`/api/signals/${signal.id}/acknowledge`, {
			headers: bearer(tokenFor('quality')),
			data: { cause: 'Moon phase', action: 'Adjust pressure' }
		});
		expect(unlisted.status()).toBe(422);
		expect((await unlisted.json()).errors[0].field).toBe('cause');

		await signInAs(page, 'quality');
		await page.goto(`/signals?status=open&chart=${signal.chartId}`);
		const card = page.getByTestId(`signal-${signal.id}`);
		await expect(card).toContainText('▲ Open');
		await card.getByText('Acknowledge', { exact: true }).click();
		// Nothing is chosen for the person; the scope is this one signal until widened.
		await expect(card.getByLabel('Assignable cause')).toHaveValue('');
		await expect(card.getByLabel('Corrective action')).toHaveValue('');
		await expect(card.getByLabel('This signal only')).toBeChecked();
		const submit = card.getByTestId(`ack-submit-${signal.id}`);
		await expect(submit).toHaveText('Acknowledge 1 signal');
		const wider = card.getByLabel(/open signals of this pattern on this chart/);
		if (await wider.count()) {
			const n = Number(
				/All (\d+) open/.exec((await wider.locator('xpath=..').textContent()) ?? '')?.[1]
			);
			await wider.check();
			await expect(submit).toHaveText(`Acknowledge ${n} signals`);
			await card.getByLabel('This signal only').check();
		}
		// The browser refuses the form until a cause and an action are chosen.
		await submit.click();
		await expect(card).toContainText('▲ Open');
		await card.getByLabel('Assignable cause').selectOption('Board support or clamping');
		await card.getByLabel('Corrective action').selectOption('Wipe stencil');
		await card.getByLabel('Note').fill('Speed typed as 65; printer was at 40');
		await submit.click();
		await expect(page.getByRole('status').filter({ hasText: 'Acknowledged' })).toBeVisible();

		const after = await (
			await request.get(`/api/signals?chart=${signal.chartId}`, {
				headers: bearer(tokenFor('viewer'))
			})
		).json();
		const done = after.signals.find((s: { id: number }) => s.id === signal.id);
		expect(done).toMatchObject({
			status: 'acknowledged',
			acknowledgement: {
				cause: 'Board support or clamping',
				action: 'Wipe stencil',
				by: 'Dev Ashcombe'
			}
		});
		const again = await request.post(`/api/signals/${signal.id}/acknowledge`, {
			headers: bearer(tokenFor('quality')),
			data: { cause: 'Board support or clamping', action: 'Wipe stencil' }
		});
		expect(again.status()).toBe(409);

		await page.goto(`/charts/${signal.chartId}`);
		await expect(page.getByTestId('location-pane')).toBeVisible();
		await expect(page.getByTestId('phase')).toContainText('Phase II');
		await expect(
			page.locator('[data-testid="location-pane"] a[data-signal="yes"]').first()
		).toBeVisible();

		await page.context().clearCookies();
		await signInAs(page, 'admin');
		await page.goto('/admin/outbox');
		// One mail per new signal run set of the chart (the demo's first evaluation found several runs).
		const mails = page.getByText(
			/^\[Rollbead\] (Signal|\d+ signals) on Squeegee speed · PB-100 · SMT-1/
		);
		await expect(mails).toHaveCount(1);
		await expect(page.getByText('engineer@fenmoor.example').first()).toBeVisible();
	});
});

test('an engineer sets up a print-parameter chart; bad specs are named at the field', async ({
	page
}) => {
	await signInAs(page, 'engineer');
	await page.goto('/charts/new');
	// The parameter list appears only once the page runs (hydrated), so choose it before typing.
	await page.getByLabel('Measure').selectOption('print-parameter');
	await page.getByLabel('Print parameter').selectOption('squeegeePressureKg');
	await page.getByLabel('Name').fill('Pressure check · PB-100');
	await page.getByLabel('Product').selectOption({ label: 'PB-100 · Pump controller board' });
	await page.getByLabel('Chart', { exact: true }).selectOption('i-mr');
	await page.getByLabel('LSL').fill('9');
	await page.getByLabel('USL').fill('5');
	await page.getByRole('button', { name: 'Create chart' }).click();
	await expect(page.locator('#cf-lsl-error')).toContainText('LSL 9 must be below USL 5');
	await page.getByLabel('LSL').fill('5');
	await page.getByLabel('USL').fill('9');
	await page.getByRole('button', { name: 'Create chart' }).click();
	await expect(page.getByRole('heading', { level: 1 })).toHaveText('Pressure check · PB-100');
	await expect(page.getByTestId('phase')).toContainText('Phase I');
	await expect(page.getByTestId('capability')).toBeVisible();
});

// The demo's frozen squeegee-speed chart (PB-100 on SMT-1) judges every run logged on that line.
test('a print run far off the frozen limits raises a signal at once, and the follower gets one more mail', async ({
	page,
	request
}) => {
	const technician = bearer(tokenFor('technician'));
	const viewer = bearer(tokenFor('viewer'));
	const charts = (await (await request.get('/api/charts', { headers: viewer })).json()).charts as {
		id: number;
		name: string;
	}[];
	const speedChart = charts.find((c) => c.name.startsWith('Squeegee speed · PB-100 · SMT-1'));
	expect(speedChart, 'demo speed chart').toBeDefined();

	// One open run per line: end whatever is open on SMT-1 first.
	const runs = (await (await request.get('/api/print-runs?line=SMT-1', { headers: viewer })).json())
		.runs as {
		id: number;
		endedAt: string | null;
	}[];
	for (const run of runs.filter((r) => !r.endedAt)) {
		expect(
			(await request.post(`/api/print-runs/${run.id}/end`, { headers: technician })).status()
		).toBe(200);
	}

	const signalsFor = async () =>
		(await (await request.get(`/api/signals?chart=${speedChart!.id}`, { headers: viewer })).json())
			.signals as { pointKey: string; rule: string }[];
	const before = await signalsFor();

	// Every parameter on its recipe target but the squeegee speed.
	const recipes = (
		await (await request.get('/api/recipes?line=SMT-1&product=PB-100', { headers: viewer })).json()
	).recipes as { parameters: Record<string, unknown> }[];
	const recipeTargets = Object.fromEntries(
		Object.entries(recipes[0].parameters).map(([key, spec]) => {
			const window = spec as { target?: unknown; value?: unknown };
			return [key, typeof spec === 'object' && spec ? (window.target ?? window.value) : spec];
		})
	);
	const logged = await request.post('/api/print-runs', {
		headers: technician,
		data: {
			line: 'SMT-1',
			product: 'PB-100',
			stencil: 'ST-PB100',
			pasteLot: 'PL-2026-0412',
			parameters: { ...recipeTargets, squeegeeSpeedMmS: 95 },
			deviationReasons: { squeegeeSpeedMmS: 'e2e: deliberately fast stroke' }
		}
	});
	expect(logged.status(), await logged.text()).toBe(201);
	const runId = (await logged.json()).id;

	const after = await signalsFor();
	expect(after.length).toBeGreaterThan(before.length);
	// Signals name their point: a print-parameter chart's points are runs ("run:<id>").
	expect(after.filter((s) => s.pointKey === `run:${runId}`).map((s) => s.rule)).toContain('we-1');
	await request.post(`/api/print-runs/${runId}/end`, { headers: technician });

	// Runs after the acknowledgement test above, which saw the demo's one mail for this chart.
	await signInAs(page, 'admin');
	await page.goto('/admin/outbox');
	await expect(
		page.getByText(/^\[Rollbead\] (Signal|\d+ signals) on Squeegee speed · PB-100 · SMT-1/)
	).toHaveCount(2);
});
