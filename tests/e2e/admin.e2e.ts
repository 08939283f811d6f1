import { expect, test } from '@playwright/test';
import { bearer, demoUser, signIn, signInAs } from './helpers';

test.describe('administration', () => {
	test('an admin adds a person, who signs in; deactivated, they no longer can', async ({
		browser
	}) => {
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
		await expect(adminPage.getByRole('status')).toContainText(
			'Added Flo Hedgecroft as technician.'
		);
		await expect(adminPage.getByRole('cell', { name: email })).toBeVisible();

		const techPage = await browser.newPage();
		await signIn(techPage, email, 'long-enough-password');
		await expect(techPage.getByTestId('viewer')).toContainText('Flo Hedgecroft');
		await techPage.close();

		await adminPage.reload();
		const row = adminPage.getByRole('row').filter({ hasText: email });
		await row.getByRole('button', { name: 'Deactivate' }).click();
		// A confirmation names who goes; Cancel (the default focus) keeps them.
		const dialog = adminPage.getByRole('dialog', { name: 'Deactivate Flo Hedgecroft?' });
		await expect(dialog).toBeVisible();
		await expect(dialog).toContainText(email);
		await adminPage.keyboard.press('Enter');
		await expect(dialog).toBeHidden();
		await expect(row.getByRole('cell', { name: 'Active', exact: true })).toBeVisible();
		await row.getByRole('button', { name: 'Deactivate' }).click();
		await dialog.getByRole('button', { name: 'Deactivate Flo Hedgecroft' }).click();
		await expect(adminPage.getByRole('status')).toContainText('Flo Hedgecroft deactivated');
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
		await expect(page.getByRole('alert')).toContainText(
			'Too many failed attempts. Try again in 15 minutes'
		);
	});

	test('an admin makes a token that works, then revokes it', async ({ page, request }) => {
		await signInAs(page, 'admin');
		await page.goto('/admin/tokens');
		await page.getByLabel('Name (who uses it)').fill('line 2 exporter');
		// Least privilege: the form starts at the lowest role and 90 days.
		await expect(page.getByLabel('Role')).toHaveValue('viewer');
		await expect(page.getByLabel('Valid for (days)')).toHaveValue('90');
		await page.getByLabel('Role').selectOption('quality');
		await page.getByRole('button', { name: 'Make token' }).click();
		const token = (await page.getByTestId('new-token').textContent())?.trim() ?? '';
		expect(token).toMatch(/^rb_/);

		const me = await request.get('/api/me', { headers: bearer(token) });
		expect(me.status()).toBe(200);
		expect(await me.json()).toMatchObject({
			kind: 'token',
			name: 'line 2 exporter',
			role: 'quality'
		});

		await page.reload();
		const row = page.getByRole('row').filter({ hasText: 'line 2 exporter' });
		await row.getByRole('button', { name: 'Revoke' }).click();
		const dialog = page.getByRole('dialog', { name: 'Revoke token “line 2 exporter”?' });
		await expect(dialog).toContainText('stops working at once');
		await page.keyboard.press('Escape');
		await expect(dialog).toBeHidden();
		expect((await request.get('/api/me', { headers: bearer(token) })).status()).toBe(200);
		await row.getByRole('button', { name: 'Revoke' }).click();
		await dialog.getByRole('button', { name: 'Revoke “line 2 exporter”' }).click();
		await expect(row.getByRole('cell', { name: /^Revoked/ })).toBeVisible();

		const after = await request.get('/api/me', { headers: bearer(token) });
		expect(after.status()).toBe(401);
		expect(await after.json()).toEqual({ error: 'The Bearer token has been revoked.' });
	});

	test('new people start as viewers; the last administrator cannot be demoted', async ({
		page
	}) => {
		await signInAs(page, 'admin');
		await page.goto('/admin/users');
		await expect(page.locator('form[action="?/createUser"]').getByLabel('Role')).toHaveValue(
			'viewer'
		);
		const me = demoUser('admin');
		const row = page.getByRole('row').filter({ hasText: me.email });
		await row.getByLabel(`Role of ${me.name}`).selectOption('engineer');
		await row.getByRole('button', { name: 'Change' }).click();
		await expect(page.getByRole('alert')).toHaveText(
			'This is the last active administrator; make someone else an administrator first.'
		);
		// Still an administrator, still signed in.
		await page.reload();
		await expect(page.getByTestId('viewer-role')).toHaveText('Administrator');
		const status = await page.evaluate(
			async (id) => {
				const body = new FormData();
				body.set('userId', String(id));
				body.set('active', 'false');
				body.set('confirm', 'yes');
				return (
					await fetch('/admin/users?/setActive', {
						method: 'POST',
						body,
						headers: { 'x-sveltekit-action': 'true' }
					})
				).json();
			},
			await row.locator('input[name="userId"]').first().inputValue()
		);
		expect(status).toMatchObject({ type: 'failure', status: 409 });
	});

	test('an administrator signs someone out everywhere; their copied cookie stops working', async ({
		browser
	}) => {
		const tech = await browser.newContext();
		const techPage = await tech.newPage();
		await signInAs(techPage, 'viewer');
		const admin = await browser.newPage();
		await signInAs(admin, 'admin');
		await admin.goto('/admin/users');
		const row = admin.getByRole('row').filter({ hasText: demoUser('viewer').email });
		await expect(row.getByTestId('session-count')).not.toHaveText('0');
		await row.getByRole('button', { name: /out everywhere/ }).click();
		await expect(admin.getByRole('status')).toContainText('signed out everywhere');
		await techPage.goto('/factory');
		await expect(techPage).toHaveURL(/\/signin\?redirectTo=%2Ffactory/);
		await tech.close();
		await admin.close();
	});

	test('without JavaScript, revoking asks on a confirmation step first', async ({ browser }) => {
		const context = await browser.newContext({ javaScriptEnabled: false });
		const page = await context.newPage();
		await signInAs(page, 'admin');
		await page.goto('/admin/tokens');
		await page.getByLabel('Name (who uses it)').fill('no-js exporter');
		await page.getByRole('button', { name: 'Make token' }).click();
		await expect(page.getByTestId('new-token')).toBeVisible();
		await page.goto('/admin/tokens');
		const row = page.getByRole('row').filter({ hasText: 'no-js exporter' });
		await expect(row.getByRole('cell', { name: 'Viewer' })).toBeVisible();
		await row.getByRole('button', { name: 'Revoke', exact: true }).click();
		const step = page.getByRole('alertdialog', { name: 'Revoke token “no-js exporter”?' });
		await expect(step).toContainText('stops working at once');
		await page.goto('/admin/tokens');
		await expect(
			page
				.getByRole('row')
				.filter({ hasText: 'no-js exporter' })
				.getByRole('cell', { name: 'Active' })
		).toBeVisible();
		await page
			.getByRole('row')
			.filter({ hasText: 'no-js exporter' })
			.getByRole('button', { name: 'Revoke', exact: true })
			.click();
		await step.getByRole('button', { name: 'Revoke “no-js exporter”' }).click();
		await expect(
			page
				.getByRole('row')
				.filter({ hasText: 'no-js exporter' })
				.getByRole('cell', { name: /^Revoked/ })
		).toBeVisible();
		await context.close();
	});

	test('the outbox page explains where mail goes when no SMTP server is set', async ({ page }) => {
		await signInAs(page, 'admin');
		await page.goto('/admin/outbox');
		await expect(page.getByText('No SMTP server is configured (SMTP_URL)')).toBeVisible();
	});
});
