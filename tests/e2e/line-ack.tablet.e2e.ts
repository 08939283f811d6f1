import { expect, test } from '@playwright/test';
import { demoUser, signInAs } from './helpers';
import { signalOfRun, startSignallingRun } from './signal-run';

test('a technician follows a signal to its marked chart point and acknowledges it at the line', async ({
	page,
	request
}) => {
	const { runId, technician, endRun } = await startSignallingRun(request, 59);
	try {
		const { signal, lineId } = await signalOfRun(request, runId);

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
		await page.goto(`/lines/${lineId}`);
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
		await endRun();
	}
});
