import { expect, test } from '@playwright/test';
import { signInAs } from './helpers';

test('on a tablet the menu opens by touch and every control is at least 44 px tall', async ({
	page
}) => {
	await signInAs(page, 'technician');
	const menu = page.getByRole('button', { name: 'Menu' });
	await menu.tap();
	await expect(menu).toHaveAttribute('aria-expanded', 'true');
	const nav = page.getByRole('navigation', { name: 'Main' });
	await expect(nav.getByRole('link', { name: 'Lines & products' })).toBeVisible();
	const controls = page.locator('header a:visible, header button:visible');
	const count = await controls.count();
	expect(count).toBeGreaterThan(2);
	for (let i = 0; i < count; i++) {
		const box = await controls.nth(i).boundingBox();
		expect(box?.height ?? 0, await controls.nth(i).innerText()).toBeGreaterThanOrEqual(44);
	}
});
