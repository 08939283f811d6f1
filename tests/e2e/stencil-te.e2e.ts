import { expect, test } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

// The stencil page's predicted TE (issue 17) is the same site model as the analysis API's: its
// counts and the lowest prediction must agree with GET /api/analysis/predicted-te.
test('a demo stencil shows each aperture’s predicted TE and whether the site’s data cover it', async ({
	page,
	request
}) => {
	const viewer = bearer(tokenFor('viewer'));
	const stencils = (await (await request.get('/api/stencils', { headers: viewer })).json())
		.stencils as { id: number; name: string }[];
	const id = stencils.find((s) => s.name === 'ST-SH220')!.id;
	const predicted = await (
		await request.get(`/api/analysis/predicted-te?stencil=${id}&floor=0.7`, { headers: viewer })
	).json();
	expect(predicted.model).not.toBeNull();
	const covered = predicted.apertures - predicted.notCovered;

	await signInAs(page, 'engineer');
	await page.goto(`/stencils/${id}`);
	const card = page.getByTestId('te-summary');
	await expect(card).toContainText(`${covered.toLocaleString('en-GB')} covered`, {
		timeout: 30_000
	});
	await expect(card).toContainText(
		`${predicted.notCovered.toLocaleString('en-GB')} outside the site’s data`
	);
	await expect(card).toContainText(
		`${predicted.belowFloor.toLocaleString('en-GB')} predicted below TE 0.70`
	);

	// The table opens sorted by area ratio, lowest first: with TE rising with area ratio, its first
	// row carries the lowest predicted TE of the stencil.
	const table = page.getByTestId('aperture-table');
	const first = table.locator('tbody tr').first().getByTestId('predicted-te');
	const lowest = predicted.listed[0];
	await expect(first).toContainText(lowest.predictedTe.toFixed(2));
	await expect(first).toContainText(lowest.covered ? 'covered' : 'outside the data');
	await expect(table.getByTestId('predicted-te')).toHaveCount(50);
});
