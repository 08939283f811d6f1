import { expect, test } from '@playwright/test';
import Papa from 'papaparse';
import { bearer, signInAs, tokenFor } from './helpers';

test.describe('audit trail', () => {
	test('a quality engineer reads who changed what, filters it and downloads it as CSV', async ({
		page
	}) => {
		await signInAs(page, 'quality');
		await page.goto('/audit');
		await expect(page.getByRole('heading', { name: 'Audit trail' })).toBeVisible();
		const total = Number((await page.getByTestId('audit-total').textContent())?.split(' ')[0]);
		expect(total).toBeGreaterThan(0);

		await page.getByLabel('Kind of record').selectOption('user');
		await page.getByRole('button', { name: 'Show' }).click();
		await expect(page).toHaveURL(/kind=user/);
		const kinds = await page.locator('tbody tr td:nth-child(4)').allTextContents();
		expect(kinds.length).toBeGreaterThan(0);
		for (const kind of kinds) expect(kind).toMatch(/^user( #\d+)?$/);

		const [download] = await Promise.all([
			page.waitForEvent('download'),
			page.getByTestId('audit-csv').click()
		]);
		const text = await (
			await download.createReadStream()
		)
			.toArray()
			.then((c) => Buffer.concat(c).toString('utf8'));
		const rows = Papa.parse<string[]>(text.trimEnd(), { delimiter: ',', newline: '\r\n' }).data;
		expect(rows[0]).toEqual([
			'id',
			'at',
			'actor',
			'actor_name',
			'action',
			'kind',
			'record_id',
			'before',
			'after'
		]);
		expect(rows.length).toBeGreaterThan(1);
		for (const row of rows.slice(1)) expect(row[5]).toBe('user');

		// A bad filter is named, not a 500.
		const bad = await page.goto('/audit?from=2026-99-01');
		expect(bad?.status()).toBe(200);
		await expect(page.getByRole('alert')).toContainText('from must be a date');
	});

	test('the API pages and filters; nobody can change or delete entries; other roles are refused', async ({
		request
	}) => {
		const quality = bearer(tokenFor('quality'));
		const first = await request.get('/api/audit?pageSize=2', { headers: quality });
		expect(first.status()).toBe(200);
		const body = await first.json();
		expect(body).toMatchObject({ page: 1, pageSize: 2 });
		expect(body.entries.length).toBeLessThanOrEqual(2);
		expect(body.total).toBeGreaterThanOrEqual(body.entries.length);
		expect(Object.keys(body.entries[0]).sort()).toEqual(
			[
				'action',
				'actor',
				'actorName',
				'after',
				'at',
				'before',
				'id',
				'kind',
				'recordId',
				'userId'
			].sort()
		);

		const bad = await request.get('/api/audit?user=abc&to=yesterday', { headers: quality });
		expect(bad.status()).toBe(400);
		const fields = (await bad.json()).fields.map((f: { field: string }) => f.field).sort();
		expect(fields).toEqual(['to', 'user']);

		for (const method of ['POST', 'PUT', 'PATCH', 'DELETE']) {
			const response = await request.fetch('/api/audit', {
				method,
				headers: bearer(tokenFor('admin'))
			});
			expect(response.status(), method).toBe(405);
		}
		expect(
			(await request.get('/api/audit', { headers: bearer(tokenFor('engineer')) })).status()
		).toBe(403);
		expect(
			(await request.get('/api/audit/export.csv', { headers: bearer(tokenFor('viewer')) })).status()
		).toBe(403);
		expect((await request.get('/api/audit', { headers: bearer(tokenFor('admin')) })).status()).toBe(
			200
		);
	});

	test('a technician is refused the audit page', async ({ page }) => {
		await signInAs(page, 'technician');
		const response = await page.goto('/audit');
		expect(response?.status()).toBe(403);
	});
});
