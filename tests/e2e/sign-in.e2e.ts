import { expect, test, type Page } from '@playwright/test';
import Database from 'better-sqlite3';
import { ROLE_LABELS, ROLES } from '../../src/lib/access';
import { demoUser, E2E_DATABASE, signIn, signInAs } from './helpers';

/** The newest mail to an address in the local outbox (the e2e server has no SMTP). */
async function outboxMailTo(address: string, after: number): Promise<string | null> {
	for (let attempt = 0; attempt < 50; attempt++) {
		const db = new Database(E2E_DATABASE, { readonly: true, fileMustExist: true });
		try {
			const row = db
				.prepare(
					'SELECT text_body FROM mail_outbox WHERE to_addresses LIKE ? AND created_at > ? ORDER BY id DESC'
				)
				.get(`%${address}%`, after) as { text_body: string } | undefined;
			if (row) return row.text_body;
		} finally {
			db.close();
		}
		await new Promise((r) => setTimeout(r, 100));
	}
	return null;
}

async function addPerson(page: Page, name: string, email: string, password: string) {
	await signInAs(page, 'admin');
	await page.goto('/admin/users');
	const form = page.locator('form[action="?/createUser"]');
	await form.getByLabel('Name').fill(name);
	await form.getByLabel('E-mail').fill(email);
	await form.getByLabel(/First password/).fill(password);
	await form.getByRole('button', { name: 'Add person' }).click();
	await expect(page.getByRole('status')).toContainText(`Added ${name} as viewer.`);
}

test.describe('sign-in and roles', () => {
	for (const role of ROLES) {
		test(`${role} signs in, sees their role and only their sections, and signs out`, async ({
			page
		}) => {
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

	test('an unknown e-mail gets the same answer as a wrong password', async ({ page }) => {
		await signIn(page, 'nobody.at.all@fenmoor.example', 'not-the-password');
		await expect(page.getByRole('alert')).toHaveText('Wrong e-mail or password.');
	});

	test('after sign-in only paths on our own origin are followed', async ({ page, request }) => {
		for (const hostile of [
			'/\\evil.example',
			'//evil.example',
			'/\t/evil.example',
			'https://evil.example/'
		]) {
			await page.goto(`/signin?redirectTo=${encodeURIComponent(hostile)}`);
			await expect(page.locator('input[name="redirectTo"]')).toHaveValue('/');
		}
		await page.goto(`/signin?redirectTo=${encodeURIComponent('/\\evil.example')}`);
		const user = demoUser('viewer');
		await page.getByLabel('E-mail').fill(user.email);
		await page.getByLabel('Password').fill(user.password);
		await page.getByRole('button', { name: 'Sign in' }).click();
		await expect(page.getByTestId('viewer')).toContainText(user.name);
		expect(page.url()).not.toContain('evil');

		// Signed in, a hostile redirectTo lands on the overview.
		await page.goto(`/signin?redirectTo=${encodeURIComponent('/\\evil.example')}`);
		await expect(page).toHaveURL(/\/$/);
		expect(page.url()).not.toContain('evil');

		// A forged redirectTo posted with the form and forged Host headers do not steer Auth.js.
		const base = new URL(page.url()).origin;
		// A forged Host header on the redirect to sign-in (this request context is not signed in yet).
		const bounced = await request.get('/factory', {
			headers: { host: 'evil.example' },
			maxRedirects: 0
		});
		expect(bounced.status()).toBe(303);
		expect(bounced.headers()['location']).toBe('/signin?redirectTo=%2Ffactory');
		const response = await request.post('/signin', {
			form: {
				email: user.email,
				password: user.password,
				providerId: 'credentials',
				redirectTo: '/\\evil.example'
			},
			headers: {
				accept: 'text/html',
				origin: base,
				'x-forwarded-host': 'evil.example',
				'x-forwarded-proto': 'https'
			},
			maxRedirects: 0
		});
		expect([302, 303]).toContain(response.status());
		const location = response.headers()['location'];
		expect(new URL(location, base).origin).toBe(base);
		expect(location).not.toContain('evil');
		expect(response.headers()['set-cookie']).not.toContain('evil');

		// A forged Host header on the Auth.js sign-out.
		const signedOut = await request.post('/signout', {
			form: { redirectTo: '/signin' },
			headers: {
				accept: 'text/html',
				origin: base,
				host: 'evil.example',
				'x-forwarded-host': 'evil.example'
			},
			maxRedirects: 0
		});
		expect([302, 303]).toContain(signedOut.status());
		expect(new URL(signedOut.headers()['location'], base).origin).toBe(base);
	});

	test('signing out ends the session: a copied cookie no longer works', async ({ browser }) => {
		const context = await browser.newContext();
		const page = await context.newPage();
		await signInAs(page, 'quality');
		const copied = await context.cookies();
		const thief = await browser.newContext();
		await thief.addCookies(copied);
		const stolen = await thief.newPage();
		await stolen.goto('/factory');
		await expect(stolen.getByTestId('viewer')).toContainText(demoUser('quality').name);

		await page.getByRole('button', { name: 'Sign out' }).click();
		await expect(page).toHaveURL(/\/signin/);

		await thief.clearCookies();
		await thief.addCookies(copied);
		await stolen.goto('/factory');
		await expect(stolen).toHaveURL(/\/signin\?redirectTo=%2Ffactory/);
		await context.close();
		await thief.close();
	});

	test('a password change ends every session; sign out everywhere too', async ({ browser }) => {
		const email = `pw.change.${Date.now()}@fenmoor.example`;
		const admin = await browser.newPage();
		await addPerson(admin, 'Hal Pennyfeather', email, 'first-long-password');
		await admin.close();

		const a = await browser.newContext();
		const pageA = await a.newPage();
		await signIn(pageA, email, 'first-long-password');
		const b = await browser.newContext();
		const pageB = await b.newPage();
		await signIn(pageB, email, 'first-long-password');
		await expect(pageB.getByTestId('viewer')).toContainText('Hal Pennyfeather');

		await pageA.getByRole('link', { name: 'Hal Pennyfeather' }).click();
		await expect(pageA.getByTestId('own-sessions')).toContainText('2 live sessions');
		await pageA.getByLabel('Current password').fill('wrong-password');
		await pageA.getByLabel(/^New password \(/).fill('second-long-password');
		await pageA.getByLabel('New password again').fill('second-long-password');
		await pageA.getByRole('button', { name: 'Change password' }).click();
		await expect(pageA.locator('#currentPassword-error')).toHaveText(
			'The current password is wrong.'
		);
		await pageA.getByLabel('Current password').fill('first-long-password');
		await pageA.getByLabel(/^New password \(/).fill('second-long-password');
		await pageA.getByLabel('New password again').fill('second-long-password');
		await pageA.getByRole('button', { name: 'Change password' }).click();
		await expect(pageA).toHaveURL(/\/signin\?changed=password/);
		await pageB.goto('/factory');
		await expect(pageB).toHaveURL(/\/signin/);

		await signIn(pageA, email, 'second-long-password');
		await signIn(pageB, email, 'second-long-password');
		await expect(pageB.getByTestId('viewer')).toContainText('Hal Pennyfeather');
		await pageA.goto('/account');
		await pageA.getByRole('button', { name: 'Sign out everywhere' }).click();
		await expect(pageA).toHaveURL(/\/signin\?changed=sessions/);
		await pageB.goto('/factory');
		await expect(pageB).toHaveURL(/\/signin/);
		await a.close();
		await b.close();
	});

	test('a password reset link by mail works once; unknown addresses get the same answer', async ({
		browser,
		page
	}) => {
		const email = `reset.${Date.now()}@fenmoor.example`;
		const admin = await browser.newPage();
		await addPerson(admin, 'Ivo Saltmarsh', email, 'forgotten-password');
		await admin.close();
		const old = await browser.newContext();
		const oldPage = await old.newPage();
		await signIn(oldPage, email, 'forgotten-password');
		await expect(oldPage.getByTestId('viewer')).toContainText('Ivo Saltmarsh');

		const asked = Date.now() - 1000;
		await page.goto('/signin');
		await page.getByRole('link', { name: 'Forgot your password?' }).click();
		await expect(page.getByRole('button', { name: 'Send the link' })).toBeVisible();
		await page.getByLabel('E-mail').fill('nobody.here@fenmoor.example');
		await page.getByRole('button', { name: 'Send the link' }).click();
		const sameAnswer = await page.getByTestId('reset-sent').textContent();
		await page.goto('/signin/reset');
		await page.getByLabel('E-mail').fill(email);
		await page.getByRole('button', { name: 'Send the link' }).click();
		await expect(page.getByTestId('reset-sent')).toHaveText(sameAnswer!);

		const mail = await outboxMailTo(email, asked);
		expect(mail).not.toBeNull();
		const link = /(https?:\/\/\S+\/signin\/reset\?token=[A-Za-z0-9_-]{43})/.exec(mail!)![1];
		expect(new URL(link).origin).toBe(new URL(page.url()).origin);
		expect(await outboxMailTo('nobody.here@fenmoor.example', asked)).toBeNull();

		await page.goto(link);
		await page.getByLabel(/^New password \(/).fill('remembered-password');
		await page.getByLabel('New password again').fill('remembered-password');
		await page.getByRole('button', { name: 'Set the password' }).click();
		await expect(page.getByTestId('reset-done')).toBeVisible();
		// The session from before the reset has ended.
		await oldPage.goto('/factory');
		await expect(oldPage).toHaveURL(/\/signin/);
		await old.close();

		await signIn(page, email, 'remembered-password');
		await expect(page.getByTestId('viewer')).toContainText('Ivo Saltmarsh');
		// Single use.
		await page.goto(link);
		await expect(page.getByTestId('reset-invalid')).toContainText('not valid any more');
	});
});
