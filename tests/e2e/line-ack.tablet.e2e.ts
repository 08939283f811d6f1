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

test('a technician follows a signal to its marked chart point and acknowledges it at the line', async ({
	page,
	request
}) => {
	const technician = bearer(tokenFor('technician'));
	const open = await (
		await request.get('/api/print-runs?line=SMT-1&open=true', { headers: technician })
	).json();
	for (const run of open.runs)
		await request.post(`/api/print-runs/${run.id}/end`, { headers: technician, data: {} });
	// 59 mm/s: inside the recipe window, far above the frozen squeegee-speed limits (a signal).
	const started = await request.post('/api/print-runs', {
		headers: technician,
		data: {
			line: 'SMT-1',
			product: 'PB-100',
			stencil: 'ST-PB100',
			pasteLot: 'PL-2026-0412',
			parameters: { ...ON_TARGET, squeegeeSpeedMmS: 59 }
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

		// The API stays with the SPC editors: technicians acknowledge at their line only.
		const lists = { cause: 'Squeegee pressure drift', action: 'Adjust speed' };
		const api = await request.post(`/api/signals/${signal.id}/acknowledge`, {
			headers: technician,
			data: lists
		});
		expect(api.status()).toBe(403);

		await signInAs(page, 'technician');
		// From the signals list: the point link opens the chart with the point marked.
		await page.goto(`/signals?status=open&chart=${signal.chartId}`);
		await page.getByTestId(`signal-${signal.id}`).getByTestId('signal-point-link').click();
		await expect(page).toHaveURL(
			new RegExp(`/charts/${signal.chartId}\\?point=${encodeURIComponent(`run:${runId}`)}$`)
		);
		await expect(page.getByTestId('marked-note')).toContainText(`run ${runId}`);
		await expect(
			page
				.getByTestId('location-pane')
				.locator(`[data-point="run:${runId}"]`)
				.getByTestId('marked-point')
		).toHaveCount(1);
		await expect(page.getByTestId('location-pane').getByTestId('marked-point')).toBeInViewport();

		// From the line view: the same link, then the acknowledgement with chosen cause and action.
		await page.goto(`/lines/${smt1.id}`);
		const card = page.getByTestId(`line-signal-${signal.id}`);
		await expect(card.getByRole('link', { name: /chart point/ })).toHaveAttribute(
			'href',
			`/charts/${signal.chartId}?point=${encodeURIComponent(`run:${runId}`)}`
		);
		await expect(card.getByLabel('Assignable cause')).toHaveValue('');
		await expect(card.getByLabel('Corrective action')).toHaveValue('');
		await card.getByLabel('Assignable cause').selectOption(lists.cause);
		await card.getByLabel('Corrective action').selectOption(lists.action);
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
			...lists,
			by: demoUser('technician').name
		});
	} finally {
		await request.post(`/api/print-runs/${runId}/end`, { headers: technician, data: {} });
	}
});
