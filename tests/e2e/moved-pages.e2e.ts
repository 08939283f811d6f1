import { expect, test } from '@playwright/test';
import { signInAs } from './helpers';

// Page paths now match the API (/print-runs, /paste-lots); old links must still land.
test('old print-run and paste-lot page paths redirect to the new ones', async ({ page }) => {
	await signInAs(page, 'technician');
	await page.goto('/runs/new?line=SMT-3&product=LM-48');
	await expect(page).toHaveURL(/\/print-runs\/new\?line=SMT-3&product=LM-48$/);
	await page.goto('/paste');
	await expect(page).toHaveURL(/\/paste-lots$/);
	await expect(page.getByRole('heading', { level: 1 })).toContainText(/paste lots/i);

	const direct = await page.request.get('/runs/7', { maxRedirects: 0 });
	expect(direct.status()).toBe(308);
	expect(direct.headers()['location']).toBe('/print-runs/7');
});

test('a record path whose id is not a positive whole number is not found', async ({
	page,
	request
}) => {
	await signInAs(page, 'engineer');
	for (const path of ['/stencils/abc', '/print-runs/0', '/charts/1e3']) {
		const response = await page.goto(path);
		expect(response?.status(), path).toBe(404);
	}
	const api = await request.get('/api/stencils/-1', { maxRedirects: 0 });
	expect(api.status()).toBe(404);
	expect(api.headers()['content-type']).toContain('application/json');
});
