import { expect, test } from '@playwright/test';
import { bearer, signIn, signInAs } from './helpers';

test.describe('administration', () => {
	test('an admin adds a person, who signs in; deactivated, they no longer can', async ({ browser }) => {
		const adminPage = await browser.newPage();
		await signInAs(adminPage, 'admin');
		await adminPage.goto('/admin/users');
		const email = `new.tech.${Date.now()}@fenmoor.example`;
		const form = adminPage.locator('form[action="?/createUser"]');
		await form.getByLabel('Name').fill('Flo Hedgecroft');
		await form.getByLabel('E-mail').fill(email);
		await form.getByLabel('Role').selectOption('technician');
		await form.getByLabel(/First password/).fill('short');
		await form.getByRole('button', { name: 'Add person' }).click();
		await expect(form.getByText('Password must be at least 10 characters')).toBeVisible();
		await form.getByLabel(/First password/).fill('long-enough-password');
		await form.getByRole('button', { name: 'Add person' }).click();
		await expect(adminPage.getByRole('status')).toContainText('Added Flo Hedgecroft as technician.');
		await expect(adminPage.getByRole('cell', { name: email })).toBeVisible();

		const techPage = await browser.newPage();
		await signIn(techPage, email, 'long-enough-password');
		await expect(techPage.getByTestId('viewer')).toContainText('Flo Hedgecroft');
		await techPage.close();

		await adminPage.reload();
		const row = adminPage.getByRole('row').filter({ hasText: email });
		await row.getByRole('button', { name: 'Deactivate' }).click();
		await expect(adminPage.getByRole('status')).toContainText('User deactivated');
		await expect(row.getByRole('cell', { name: 'Deactivated' })).toBeVisible();

		const again = await browser.newPage();
		await signIn(again, email, 'long-enough-password');
		await expect(again.getByRole('alert')).toHaveText('Wrong e-mail or password.');
		await again.close();

		// The same address cannot be added twice.
		await form.getByLabel('Name').fill('Flo Again');
		await form.getByLabel('E-mail').fill(email);
		await form.getByLabel(/First password/).fill('long-enough-password');
		await form.getByRole('button', { name: 'Add person' }).click();
		await expect(form.getByText(`A user with the e-mail ${email} already exists.`)).toBeVisible();
		await adminPage.close();
	});

	test('sign-in is throttled after five failures for one account', async ({ browser }) => {
		const adminPage = await browser.newPage();
		await signInAs(adminPage, 'admin');
		await adminPage.goto('/admin/users');
		const email = `throttle.${Date.now()}@fenmoor.example`;
		const form = adminPage.locator('form[action="?/createUser"]');
		await form.getByLabel('Name').fill('Gil Throttleby');
		await form.getByLabel('E-mail').fill(email);
		await form.getByLabel(/First password/).fill('the-right-password');
		await form.getByRole('button', { name: 'Add person' }).click();
		await expect(adminPage.getByRole('status')).toContainText('Added Gil Throttleby');
		await adminPage.close();

		const page = await browser.newPage();
		for (let attempt = 0; attempt < 5; attempt++) {
			await signIn(page, email, 'wrong-password');
			await expect(page.getByRole('alert')).toHaveText('Wrong e-mail or password.');
		}
		await signIn(page, email, 'the-right-password');
		await expect(page.getByRole('alert')).toContainText('Too many failed attempts. Try again in 15 minutes');
	});

	test('an admin makes a token that works, then revokes it', async ({ page, request }) => {
		await signInAs(page, 'admin');
		await page.goto('/admin/tokens');
		await page.getByLabel('Name (who uses it)').fill('line 2 exporter');
		await page.getByLabel('Role').selectOption('quality');
		await page.getByRole('button', { name: 'Make token' }).click();
		const token = (await page.getByTestId('new-token').textContent())?.trim() ?? '';
		expect(token).toMatch(/^rb_/);

		const me = await request.get('/api/me', { headers: bearer(token) });
		expect(me.status()).toBe(200);
		expect(await me.json()).toMatchObject({ kind: 'token', name: 'line 2 exporter', role: 'quality' });

		await page.reload();
		const row = page.getByRole('row').filter({ hasText: 'line 2 exporter' });
		await row.getByRole('button', { name: 'Revoke' }).click();
		await expect(row.getByRole('cell', { name: /^Revoked/ })).toBeVisible();

		const after = await request.get('/api/me', { headers: bearer(token) });
		expect(after.status()).toBe(401);
		expect(await after.json()).toEqual({ error: 'The Bearer token has been revoked.' });
	});

	test('the outbox page explains where mail goes when no SMTP server is set', async ({ page }) => {
		await signInAs(page, 'admin');
		await page.goto('/admin/outbox');
		await expect(page.getByText('No SMTP server is configured (SMTP_URL)')).toBeVisible();
	});
});
