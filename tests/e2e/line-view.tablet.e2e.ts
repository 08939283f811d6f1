import { expect, test } from '@playwright/test';
import { demoUser, signInAs } from './helpers';
import { signalOfRun, startSignallingRun } from './signal-run';

test('line view on a tablet: a new signal from a run, taken and acknowledged with chosen cause and action', async ({
	page,
	request
}) => {
	const { runId, technician, endRun } = await startSignallingRun(request, 58);
	try {
		const { signal, lineId } = await signalOfRun(request, runId);

		await signInAs(page, 'quality');
		await page.goto(`/lines/${lineId}`);
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
		await endRun();
	}
});
