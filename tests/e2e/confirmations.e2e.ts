import { expect, test } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

const FIXTURES = 'tests/fixtures/stencil';

test.describe('confirmations before destructive actions', () => {
	test("replacing a stencil's apertures names how many go; Cancel keeps them", async ({ page }) => {
		await signInAs(page, 'engineer');
		await page.goto('/stencils');
		const name = `ST-CONF-${Date.now() % 1_000_000}`;
		const create = page.locator('form[action="?/create"]');
		await create.getByLabel('Name (label text)').fill(name);
		await create.getByLabel('Revision').fill('B');
		await create.getByLabel('Foil thickness (µm)').fill('127');
		await create.getByLabel('Technology').selectOption('laser-stainless');
		await create.getByRole('button', { name: 'Create stencil' }).click();
		await expect(page.getByRole('heading', { level: 1 })).toContainText(name);

		const panel = page.getByTestId('import-form');
		await panel
			.getByLabel('Aperture file (CSV or Gerber)')
			.setInputFiles(`${FIXTURES}/apertures.csv`);
		await panel.getByLabel('CSV unit').selectOption('mm');
		await panel.getByRole('button', { name: 'Import apertures' }).click();
		await expect(page.getByTestId('import-done')).toContainText('the stencil now holds 4');

		// Adding more asks nothing.
		await panel
			.getByLabel('Aperture file (CSV or Gerber)')
			.setInputFiles(`${FIXTURES}/apertures.csv`);
		await panel.getByRole('button', { name: 'Import apertures' }).click();
		await expect(page.getByTestId('import-done')).toContainText('the stencil now holds 8');

		await panel
			.getByLabel('Aperture file (CSV or Gerber)')
			.setInputFiles(`${FIXTURES}/apertures.csv`);
		await panel.getByLabel('Existing apertures').selectOption('replace');
		await panel.getByRole('button', { name: 'Import apertures' }).click();
		const dialog = page.getByRole('dialog', { name: `Replace the apertures of ${name} rev B?` });
		await expect(dialog).toContainText('All 8 apertures');
		// Keyboard: focus starts on Cancel.
		await expect(dialog.getByRole('button', { name: 'Cancel' })).toBeFocused();
		await page.keyboard.press('Enter');
		await expect(dialog).toBeHidden();
		await page.reload();
		await expect(page.getByTestId('stencil-summary').locator('p.text-2xl').first()).toHaveText('8');

		await panel
			.getByLabel('Aperture file (CSV or Gerber)')
			.setInputFiles(`${FIXTURES}/apertures.csv`);
		await panel.getByLabel('CSV unit').selectOption('mm');
		await panel.getByLabel('Existing apertures').selectOption('replace');
		await panel.getByRole('button', { name: 'Import apertures' }).click();
		await page.keyboard.press('Tab');
		await expect(dialog.getByRole('button', { name: 'Replace 8 apertures' })).toBeFocused();
		await page.keyboard.press('Enter');
		await expect(page.getByTestId('import-done')).toContainText('the stencil now holds 4');
	});

	test('discarding a paste lot asks first, naming the lot; other events do not', async ({
		page,
		request
	}) => {
		const lot = `PL-CONF-${Date.now() % 1_000_000}`;
		const created = await request.post('/api/paste-lots', {
			headers: bearer(tokenFor('technician')),
			data: {
				lotNumber: lot,
				alloy: 'SAC305',
				powderType: 4,
				expiresOn: '2099-06-30',
				fluxClass: 'ROL0',
				confirmDates: true
			}
		});
		expect(created.status()).toBe(201);
		const { id } = await created.json();
		await signInAs(page, 'technician');
		await page.goto(`/paste-lots/${id}`);

		await page.getByLabel('Event').selectOption('out-of-cold-storage');
		await page.getByRole('button', { name: 'Log event' }).click();
		await expect(page.getByRole('status')).toContainText('Logged: Out of cold storage.');

		await page.getByLabel('Event').selectOption('discarded');
		await page.getByRole('button', { name: 'Log event' }).click();
		const dialog = page.getByRole('dialog', { name: `Discard paste lot ${lot}?` });
		await expect(dialog).toContainText('no run can use it');
		await page.keyboard.press('Escape');
		await expect(dialog).toBeHidden();
		const before = await (
			await request.get(`/api/paste-lots/${id}`, { headers: bearer(tokenFor('viewer')) })
		).json();
		expect(JSON.stringify(before)).not.toContain('"discarded"');

		await page.getByRole('button', { name: 'Log event' }).click();
		await dialog.getByRole('button', { name: `Discard ${lot}` }).click();
		// Discarded: the lot is refused for runs and takes no more events.
		await expect(page.getByRole('listitem').filter({ hasText: 'Discarded' })).toBeVisible();
		await expect(page.getByText(`paste lot ${lot} was discarded`)).toBeVisible();
		await expect(page.getByRole('button', { name: 'Log event' })).toHaveCount(0);
	});

	test('without JavaScript, discarding a lot comes back as a confirmation step first', async ({
		browser,
		request
	}) => {
		const lot = `PL-NOJS-${Date.now() % 1_000_000}`;
		const created = await request.post('/api/paste-lots', {
			headers: bearer(tokenFor('technician')),
			data: {
				lotNumber: lot,
				alloy: 'SAC305',
				powderType: 4,
				expiresOn: '2099-06-30',
				fluxClass: 'ROL0',
				confirmDates: true
			}
		});
		const { id } = await created.json();
		const context = await browser.newContext({ javaScriptEnabled: false });
		const page = await context.newPage();
		await signInAs(page, 'technician');
		await page.goto(`/paste-lots/${id}`);
		await page.getByLabel('Event').selectOption('discarded');
		await page.getByRole('button', { name: 'Log event' }).click();
		const step = page.getByRole('alertdialog', { name: `Discard paste lot ${lot}?` });
		await expect(step).toContainText('no run can use it');
		// Nothing happened yet.
		const lotNow = async () =>
			(await request.get(`/api/paste-lots/${id}`, { headers: bearer(tokenFor('viewer')) })).json();
		expect((await lotNow()).state).not.toBe('discarded');
		await step.getByRole('button', { name: `Discard ${lot}` }).click();
		await expect(page.getByText(`paste lot ${lot} was discarded`)).toBeVisible();
		expect((await lotNow()).state).toBe('discarded');
		await context.close();
	});
});
