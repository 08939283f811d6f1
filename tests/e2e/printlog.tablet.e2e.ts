import { expect, test } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

/** The run form reacts to scans once the page is interactive. */
async function hydrated(page: import('@playwright/test').Page) {
	await expect(page.locator('form[data-hydrated="true"]')).toHaveCount(1);
}

/** Type like a keyboard-wedge scanner: characters a few ms apart, then Enter. */
async function scan(page: import('@playwright/test').Page, field: string, code: string) {
	const input = page.locator(`#field-${field}`);
	await input.click();
	await input.fill('');
	await input.pressSequentially(code, { delay: 5 });
	await input.press('Enter');
}

test.describe('print log on the tablet', () => {
	test('a technician scans stencil and lot, is warned about a value outside its window, gives the reason and starts the run', async ({
		page
	}) => {
		await signInAs(page, 'technician');
		await page.goto('/print-runs');
		await page.getByRole('link', { name: 'Log a run' }).tap();
		await expect(page).toHaveURL(/\/print-runs\/new/);
		await hydrated(page);
		await page.getByLabel('Line').selectOption('SMT-1');
		await page.getByLabel('Product').selectOption('PB-100');
		await expect(
			page.getByText('Checked against recipe version 1 for PB-100 on SMT-1')
		).toBeVisible();

		await scan(page, 'stencil', 'st-pb100');
		await expect(page.locator('#field-stencil-status')).toContainText('✓ ST-PB100 rev B');
		// Enter ended the scan: the form was not submitted and the next scan field has the focus.
		await expect(page).toHaveURL(/\/print-runs\/new/);
		await expect(page.locator('#field-pasteLot')).toBeFocused();
		await scan(page, 'pasteLot', 'PL-2026-0412');
		await expect(page.locator('#field-pasteLot-status')).toContainText('✓ PL-2026-0412');
		await expect(page.locator('#field-bladeCode')).toBeFocused();

		await page.locator('#field-squeegeeAngleDeg').fill('65');
		await expect(page.getByTestId('deviation-squeegeeAngleDeg')).toContainText(
			'Squeegee angle 65° is outside the recipe window 55–60°'
		);
		await page.getByRole('button', { name: 'Start run' }).tap();
		await expect(page.locator('#field-squeegeeAngleDeg-reason-error')).toContainText(
			'a reason is required'
		);
		await expect(page).toHaveURL(/\/print-runs\/new/);

		await page.getByLabel('Reason for squeegee angle').fill('new blade holder, angle fixed at 65°');
		await page.getByRole('button', { name: 'Start run' }).tap();
		await expect(page).toHaveURL(/\/print-runs\/\d+\?started=1/);
		await expect(page.getByText('Run started.')).toBeVisible();
		await expect(page.getByTestId('run-deviations')).toContainText(
			'reason: new blade holder, angle fixed at 65°'
		);

		// Every control of the run page is a comfortable touch target.
		const buttons = page.locator('main button:visible, main input:visible');
		for (let i = 0; i < (await buttons.count()); i++) {
			const box = await buttons.nth(i).boundingBox();
			expect(box?.height ?? 0).toBeGreaterThanOrEqual(44);
		}
		await page.locator('#end-boards').fill('120');
		await page.getByRole('button', { name: 'End run now' }).tap();
		await expect(page.getByText('Run ended.')).toBeVisible();
	});

	test('an expired paste lot is refused and nothing is saved', async ({ page, request }) => {
		const before = (
			await (
				await request.get('/api/print-runs?line=SMT-2', { headers: bearer(tokenFor('viewer')) })
			).json()
		).runs.length;
		await signInAs(page, 'technician');
		await page.goto('/print-runs/new?line=SMT-2&product=SH-220');
		await hydrated(page);
		await scan(page, 'stencil', 'ST-PB100');
		await scan(page, 'pasteLot', 'PL-2025-0977');
		await expect(page.getByTestId('run-checks')).toContainText(
			'Refused: paste lot PL-2025-0977 expired'
		);
		await page.getByRole('button', { name: 'Start run' }).tap();
		await expect(page.locator('#field-pasteLot-error')).toContainText('expired');
		await expect(page).toHaveURL(/\/print-runs\/new/);
		const after = (
			await (
				await request.get('/api/print-runs?line=SMT-2', { headers: bearer(tokenFor('viewer')) })
			).json()
		).runs.length;
		expect(after).toBe(before);
	});

	test('an unknown scan is named with suggestions; the leaded lot shows its caution', async ({
		page
	}) => {
		await signInAs(page, 'technician');
		await page.goto('/print-runs/new?line=SMT-3&product=LM-48');
		await hydrated(page);
		await scan(page, 'stencil', 'ST-PB10');
		await expect(page.locator('#field-stencil-status')).toContainText(
			'“ST-PB10” is not known: did you mean'
		);
		await page.getByRole('button', { name: 'ST-PB100' }).tap();
		await expect(page.locator('#field-stencil-status')).toContainText('✓ ST-PB100');
		await scan(page, 'pasteLot', 'PL-2026-0398');
		await expect(page.getByTestId('lead-caution')).toContainText('contains lead (Pb)');
		await expect(page.getByTestId('lead-caution')).toContainText('safety data sheet');
	});

	test('a scan that pauses midway reads whole; a scan into a field holding a code replaces it', async ({
		page
	}) => {
		await signInAs(page, 'technician');
		await page.goto('/print-runs/new?line=SMT-3&product=LM-48');
		await hydrated(page);
		const stencil = page.locator('#field-stencil');
		await stencil.click();
		await stencil.pressSequentially('st-p', { delay: 5 });
		await page.waitForTimeout(300); // a busy tablet stalls the scanner's keys
		await stencil.pressSequentially('b100', { delay: 5 });
		await stencil.press('Enter');
		await expect(page.locator('#field-stencil-status')).toContainText('✓ ST-PB100');
		// The scanner appends to the code already in the field: the new code replaces it.
		const lot = page.locator('#field-pasteLot');
		await lot.fill('PL-2026-0390');
		await lot.blur();
		await lot.click();
		await lot.press('End');
		// The scanner sends Enter right after the code (in the same burst).
		await lot.pressSequentially('PL-2026-0412\n', { delay: 5 });
		await expect(page.locator('#field-pasteLot-status')).toContainText('✓ PL-2026-0412');
	});

	test('a technician scans the first board serial with Enter: the form stays, the run keeps the serial; a corrected stroke and blade show in the history', async ({
		page,
		request
	}) => {
		await signInAs(page, 'technician');
		await page.goto('/print-runs/new?line=SMT-3&product=LM-48');
		await hydrated(page);
		await scan(page, 'stencil', 'ST-PB100');
		await scan(page, 'pasteLot', 'PL-2026-0412');
		await scan(page, 'bladeCode', 'BL-300-01');
		await expect(page.locator('#field-boardSerial')).toBeFocused();

		// A scan that is too long for a serial is named and keeps the focus.
		await scan(page, 'boardSerial', 'X'.repeat(101));
		await expect(page.locator('#field-boardSerial-status')).toContainText(
			'must be at most 100 characters (got 101)'
		);
		await expect(page.locator('#field-boardSerial')).toBeFocused();

		// The scanner sends its AIM prefix, the serial and Enter: the serial is kept in its own case,
		// Enter does not submit the run, and the next field has the focus.
		await scan(page, 'boardSerial', ']C1Fw-LM48-000501');
		await expect(page).toHaveURL(/\/print-runs\/new/);
		await expect(page.locator('#field-boardSerial')).toHaveValue('Fw-LM48-000501');
		await expect(page.locator('#field-boardSerial-status')).toContainText('✓ Fw-LM48-000501');
		await expect(page.locator('#field-squeegeeAngleDeg')).toBeFocused();
		const box = await page.locator('#field-boardSerial').boundingBox();
		expect(box?.height ?? 0).toBeGreaterThanOrEqual(44);

		await page.getByRole('button', { name: 'Start run' }).tap();
		await expect(page).toHaveURL(/\/print-runs\/\d+\?started=1/);
		await expect(page.getByTestId('run-board-serial')).toHaveText('Fw-LM48-000501');
		const id = Number(new URL(page.url()).pathname.split('/').pop());
		const api = await (
			await request.get(`/api/print-runs/${id}`, { headers: bearer(tokenFor('viewer')) })
		).json();
		expect(api).toMatchObject({ boardSerial: 'Fw-LM48-000501', bladeCode: 'BL-300-01' });

		// Correct non-numeric fields: the stroke leaves the recipe's front-to-back, so it needs a reason.
		await page.getByText('Correct values…').tap();
		await page.locator('#c-printStroke').selectOption('alternating');
		await page.locator('#c-bladeCode').fill('BL-300-02');
		await page.locator('#c-reason').fill('blade and stroke were logged from the previous job');
		await page.getByRole('button', { name: 'Save correction' }).tap();
		await expect(page.locator('#c-reason_printStroke-error')).toContainText('a reason is required');
		await page.locator('#c-reason-printStroke').fill('alternating stroke for the fine-pitch part');
		await page.locator('#c-printStroke').selectOption('alternating');
		await page.locator('#c-bladeCode').fill('BL-300-02');
		await page.locator('#c-reason').fill('blade and stroke were logged from the previous job');
		await page.getByRole('button', { name: 'Save correction' }).tap();
		await expect(
			page.getByText('Correction saved; the audit log keeps the previous values.')
		).toBeVisible();
		const history = page.getByTestId('history-changes');
		await expect(history).toContainText('Blade: BL-300-01 → BL-300-02');
		await expect(history).toContainText('Print stroke: front-to-back → alternating');
		await expect(page.locator('section[aria-labelledby="history-title"]')).toContainText(
			'blade and stroke were logged from the previous job'
		);

		await page.locator('#end-boards').fill('10');
		await page.getByRole('button', { name: 'End run now' }).tap();
		await expect(page.getByText('Run ended.')).toBeVisible();
	});

	test('a viewer cannot log a run', async ({ page, request }) => {
		await signInAs(page, 'viewer');
		await page.goto('/print-runs');
		await expect(page.getByRole('heading', { name: 'Print runs' })).toBeVisible();
		await expect(page.getByRole('link', { name: 'Log a run' })).toHaveCount(0);
		await page.goto('/print-runs/new?line=SMT-1&product=PB-100');
		await expect(page.getByText('Viewers cannot open this page.')).toBeVisible();
		const response = await request.post('/api/print-runs', {
			headers: bearer(tokenFor('viewer')),
			data: {
				line: 'SMT-1',
				product: 'PB-100',
				stencil: 'ST-PB100',
				pasteLot: 'PL-2026-0412',
				parameters: {}
			}
		});
		expect(response.status()).toBe(403);
	});
});
