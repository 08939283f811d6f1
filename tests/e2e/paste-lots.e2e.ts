import { expect, test } from '@playwright/test';
import { signInAs } from './helpers';

// Issue 13, finding 3: an expired lot never gets a green tick; odd dates at receipt are confirmed.
test('the run form marks the expired demo lot as refused, not with a tick', async ({ page }) => {
	await signInAs(page, 'technician');
	await page.goto('/print-runs/new?line=SMT-3&product=LM-48');
	await page.locator('#field-pasteLot').fill('PL-2025-0977');
	await page.locator('#field-pasteLot').press('Enter');
	const status = page.locator('#field-pasteLot-status');
	await expect(status).toContainText('✕ PL-2025-0977');
	await expect(status).not.toContainText('✓');
	await expect(page.getByTestId('run-checks')).toContainText(
		'Refused: paste lot PL-2025-0977 expired'
	);
	// A technician may not override: the run is refused with the reason.
	await page.locator('#field-stencil').fill('ST-PB100');
	await page.locator('#field-stencil').press('Enter');
	await page.getByRole('button', { name: 'Start run' }).click();
	await expect(page.locator('#field-pasteLot-error')).toContainText('expired');
	await expect(page).toHaveURL(/\/print-runs\/new/);
});

test('an engineer sees the override field for an expired lot', async ({ page }) => {
	await signInAs(page, 'engineer');
	await page.goto('/print-runs/new?line=SMT-3&product=LM-48');
	await page.locator('#field-pasteLot').fill('PL-2025-0977');
	await page.locator('#field-pasteLot').press('Enter');
	await expect(page.getByLabel('Engineer override: why use this paste lot anyway?')).toBeVisible();
});

test('registering a lot with an expiry in 2020 warns and asks for confirmation', async ({
	page
}) => {
	await signInAs(page, 'technician');
	await page.goto('/paste-lots');
	// The button works once the page has hydrated: click until the form shows.
	await expect(async () => {
		await page.getByRole('button', { name: 'Register a lot' }).click();
		await expect(page.getByLabel('Lot number')).toBeVisible({ timeout: 1000 });
	}).toPass();
	const lot = `PL-E2E-${Date.now() % 100000}`;
	await page.getByLabel('Lot number').fill(lot);
	await page.getByLabel('Alloy').fill('SAC305');
	await page.getByLabel('Powder type (J-STD-005)').selectOption('4');
	await page.getByLabel('Expires on (last day of use)').fill('2020-06-30');
	await page.getByRole('button', { name: 'Register lot' }).click();
	await expect(page.getByText('Check: the lot expired on 2020-06-30')).toBeVisible();
	await expect(page).toHaveURL(/\/paste-lots(\?|$)/);
	await page.getByTestId('confirm-dates').locator('input').check();
	await page.getByRole('button', { name: 'Register lot' }).click();
	await expect(page).toHaveURL(new RegExp(`/paste-lots/${lot}`));
});
