import { expect, test } from '@playwright/test';
import { signInAs } from './helpers';

test('pages use the shipped Noto Sans and request nothing from other hosts', async ({
	page,
	baseURL
}) => {
	const foreign: string[] = [];
	page.on('request', (req) => {
		if (!req.url().startsWith(baseURL!) && !req.url().startsWith('data:')) foreign.push(req.url());
	});
	await signInAs(page, 'engineer');
	await page.goto('/factory');
	await page.evaluate(() => document.fonts.ready);
	expect(await page.evaluate(() => document.fonts.check('700 16px "Noto Sans"'))).toBe(true);
	const family = await page.locator('h1').evaluate((el) => getComputedStyle(el).fontFamily);
	expect(family).toContain('Noto Sans');
	expect(foreign).toEqual([]);
});

test('the theme switch turns dark mode on and remembers it', async ({ page }) => {
	await signInAs(page, 'viewer');
	const html = page.locator('html');
	const toggle = page.getByRole('button', { name: 'Dark theme' });
	const wasDark = (await html.getAttribute('class'))?.includes('dark') ?? false;
	await toggle.click();
	await expect(html).toHaveClass(wasDark ? /^(?!.*dark)/ : /dark/);
	await page.reload();
	await expect(html).toHaveClass(wasDark ? /^(?!.*dark)/ : /dark/);
});

test('an engineer adds a product in the form and sees field errors first', async ({ page }) => {
	await signInAs(page, 'engineer');
	await page.goto('/factory');
	const code = `QA-${Date.now() % 100000}`;
	await page.getByLabel('New product code').fill('bad code');
	await page.getByRole('button', { name: 'Add product' }).click();
	await expect(page.getByText(/code may use letters, digits/)).toBeVisible();
	await page.getByLabel('New product code').fill(code);
	await page.locator('#field-product-name').fill('Quality audit board');
	await page.getByRole('button', { name: 'Add product' }).click();
	await expect(page.getByRole('cell', { name: code })).toBeVisible();
});

test('viewers see lines and products but no forms to change them', async ({ page }) => {
	await signInAs(page, 'viewer');
	await page.goto('/factory');
	await expect(page.getByRole('cell', { name: 'SMT-1' })).toBeVisible();
	await expect(page.getByRole('button', { name: 'Add line' })).toHaveCount(0);
});
