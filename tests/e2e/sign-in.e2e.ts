import { expect, test } from '@playwright/test';
import { ROLE_LABELS, ROLES } from '../../src/lib/access';
import { demoUser, signIn, signInAs } from './helpers';

test.describe('sign-in and roles', () => {
	for (const role of ROLES) {
		test(`${role} signs in, sees their role and only their sections, and signs out`, async ({ page }) => {
			await signInAs(page, role);
			await expect(page).toHaveURL(/\/$/);
			await expect(page.getByTestId('viewer-role')).toHaveText(ROLE_LABELS[role]);
			const nav = page.getByRole('navigation', { name: 'Main' });
			const adminMenu = nav.getByRole('button', { name: 'Admin' });
			if (role === 'admin') {
				await adminMenu.click();
				await expect(nav.getByRole('link', { name: 'People' })).toBeVisible();
				await page.keyboard.press('Escape');
				await expect(nav.getByRole('link', { name: 'People' })).toBeHidden();
			} else {
				await expect(adminMenu).toHaveCount(0);
				await expect(nav.getByRole('link', { name: 'People' })).toHaveCount(0);
			}
			// Every role sees the job groups, e.g. the control-chart menu.
			await nav.getByRole('button', { name: 'Control charts' }).click();
			await expect(nav.getByRole('link', { name: 'Signals' })).toBeVisible();

			await page.getByRole('button', { name: 'Sign out' }).click();
			await expect(page).toHaveURL(/\/signin/);
			await page.goto('/factory');
			await expect(page).toHaveURL(/\/signin\?redirectTo=%2Ffactory/);
		});
	}

	test('a wrong password says so and signs nobody in', async ({ page }) => {
		await signIn(page, demoUser('quality').email, 'not-the-password');
		await expect(page.getByRole('alert')).toHaveText('Wrong e-mail or password.');
		await expect(page).toHaveURL(/\/signin/);
	});

	test('empty fields get messages tied to the fields', async ({ page }) => {
		await page.goto('/signin');
		await page.getByLabel('E-mail').evaluate((el) => el.removeAttribute('required'));
		await page.getByLabel('Password').evaluate((el) => el.removeAttribute('required'));
		await page.getByRole('button', { name: 'Sign in' }).click();
		await expect(page.getByLabel('E-mail')).toHaveAttribute('aria-invalid', 'true');
		await expect(page.locator('#email-error')).toHaveText('Enter your e-mail');
	});

	test('a signed-out visitor is sent to sign-in and comes back after', async ({ page }) => {
		await page.goto('/factory');
		await expect(page).toHaveURL(/\/signin\?redirectTo=/);
		const user = demoUser('engineer');
		await page.getByLabel('E-mail').fill(user.email);
		await page.getByLabel('Password').fill(user.password);
		await page.getByRole('button', { name: 'Sign in' }).click();
		await expect(page).toHaveURL(/\/factory$/);
	});

	test('a technician is refused the people page with a friendly explanation', async ({ page }) => {
		await signInAs(page, 'technician');
		const response = await page.goto('/admin/users');
		expect(response?.status()).toBe(403);
		await expect(page.getByRole('heading', { name: 'Not for your role' })).toBeVisible();
		await expect(page.getByText('Line technicians cannot open this page.')).toBeVisible();
	});

	test('a technician cannot post to an admin action either', async ({ page }) => {
		await signInAs(page, 'technician');
		const status = await page.evaluate(async () => {
			const body = new FormData();
			body.set('name', 'sneaky');
			body.set('role', 'admin');
			const res = await fetch('/admin/tokens?/createToken', { method: 'POST', body });
			return res.status;
		});
		expect(status).toBe(403);
	});
});
