import { expect, test } from '@playwright/test';
import { bearer, demoUser, signInAs, tokenFor } from './helpers';

/** The SMT-1 / PB-100 demo recipe's values, on target. */
const ON_TARGET = {
	squeegeeAngleDeg: 60,
	squeegeeSpeedMmS: 40,
	squeegeePressureKg: 7,
	separationSpeedMmS: 1,
	separationDistanceMm: 2,
	printGapMm: 0,
	bladeLengthMm: 300,
	wipeIntervalPrints: 3,
	printStroke: 'alternating',
	bladeType: 'metal',
	wipeMode: 'wet-vacuum-dry',
	boardSupport: 'pins'
};

test('line view on a tablet: a new signal from a run, taken and acknowledged with chosen cause and action', async ({
	page,
	request
}) => {
	const technician = bearer(tokenFor('technician'));
	// SMT-1 must be free: end a run another test left open.
	const open = await (
		await request.get('/api/print-runs?line=SMT-1&open=true', { headers: technician })
	).json();
	for (const run of open.runs)
		await request.post(`/api/print-runs/${run.id}/end`, { headers: technician, data: {} });
	// 58 mm/s is inside the recipe window (30–60) but far above the frozen squeegee-speed chart's
	// limits (the demo's runs at about 40 mm/s): the chart stores a signal for this run.
	const started = await request.post('/api/print-runs', {
		headers: technician,
		data: {
			line: 'SMT-1',
			product: 'PB-100',
			stencil: 'ST-PB100',
			pasteLot: 'PL-2026-0412',
			parameters: { ...ON_TARGET, squeegeeSpeedMmS: 58 }
		}
	});
	expect(started.status(), await started.text()).toBe(201);
	const runId = (await started.json()).id as number;
	try {
		const signals = (
			await (await request.get('/api/signals?status=open', { headers: technician })).json()
		).signals;
		const signal = signals.find((s: { pointKey: string }) => s.pointKey === `run:${runId}`);
		expect(signal, 'a signal for the new run').toBeTruthy();
		const lines = (await (await request.get('/api/lines', { headers: technician })).json()).lines;
		const smt1 = lines.find((l: { code: string }) => l.code === 'SMT-1');

		await signInAs(page, 'quality');
		await page.goto(`/lines/${smt1.id}`);
		await expect(page.getByTestId('line-state')).toHaveText('attention');
		const card = page.getByTestId(`line-signal-${signal.id}`);
		await expect(card).toContainText('no owner');
		await expect(card.getByRole('link', { name: `run ${runId}`, exact: true })).toBeVisible();
		await expect(page.getByTestId('due-list')).toContainText('Tension check');

		// Gloved hands: every button, select and field on the page is at least 48 px tall.
		for (const control of await page
			.locator(
				'main button, main select, main input:not([type=hidden]), main a.btn-primary, main a.btn-quiet'
			)
			.all()) {
			const box = await control.boundingBox();
			if (box)
				expect(
					box.height,
					await control.evaluate((e) => e.outerHTML.slice(0, 80))
				).toBeGreaterThanOrEqual(48);
		}

		await card.getByRole('button', { name: 'Take it' }).click();
		await expect(card).toContainText(`owner ${demoUser('quality').name}`);
		// Nothing is chosen for the person: both lists start empty and are required.
		await expect(card.getByLabel('Assignable cause')).toHaveValue('');
		await expect(card.getByLabel('Corrective action')).toHaveValue('');
		await card.getByRole('button', { name: 'Acknowledge' }).click();
		await expect(card).toBeVisible();
		const causes = await card
			.getByLabel('Assignable cause')
			.locator('option:not([disabled])')
			.allTextContents();
		const actions = await card
			.getByLabel('Corrective action')
			.locator('option:not([disabled])')
			.allTextContents();
		await card.getByLabel('Assignable cause').selectOption(causes[0]);
		await card.getByLabel('Corrective action').selectOption(actions[0]);
		await card.getByRole('button', { name: 'Acknowledge' }).click();
		await expect(page.getByTestId(`line-signal-${signal.id}`)).toHaveCount(0);

		const after = (
			await (
				await request.get(`/api/signals?status=acknowledged&chart=${signal.chartId}`, {
					headers: technician
				})
			).json()
		).signals;
		expect(after.find((s: { id: number }) => s.id === signal.id).acknowledgement).toMatchObject({
			cause: causes[0],
			action: actions[0]
		});
	} finally {
		await request.post(`/api/print-runs/${runId}/end`, { headers: technician, data: {} });
	}
});
