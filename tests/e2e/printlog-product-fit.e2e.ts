import { expect, test, type APIRequestContext, type Page } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

// Issue 15, last item: stencil, paste and product belong together.
const WINDOWS = {
	squeegeeAngleDeg: { min: 45, target: 60, max: 60 },
	squeegeeSpeedMmS: { min: 20, target: 40, max: 100 },
	squeegeePressureKg: { min: 4.5, target: 7.5, max: 10.5 },
	separationSpeedMmS: { min: 0.5, target: 1, max: 3 },
	printStroke: 'alternating'
};
const ON_TARGET = {
	squeegeeAngleDeg: 60,
	squeegeeSpeedMmS: 40,
	squeegeePressureKg: 7.5,
	separationSpeedMmS: 1,
	printStroke: 'alternating'
};

/** A line and a product of their own (no other test's open run in the way), with a recipe. */
async function lineAndProduct(request: APIRequestContext, tag: string) {
	const n = `${tag}${Date.now() % 1_000_000}`;
	const engineer = bearer(tokenFor('engineer'));
	const line = `FIT-L${n}`;
	const product = `FIT-P${n}`;
	expect(
		(
			await request.post('/api/lines', { headers: engineer, data: { code: line, name: 'e2e' } })
		).status()
	).toBe(201);
	const created = await request.post('/api/products', {
		headers: engineer,
		data: { code: product, name: 'e2e fit board' }
	});
	expect(created.status()).toBe(201);
	const productId = (await created.json()).id as number;
	expect(
		(
			await request.post('/api/recipes', {
				headers: engineer,
				data: { line, product, parameters: WINDOWS }
			})
		).status()
	).toBe(201);
	return { line, product, productId };
}

/** Approve ST-PB100 (top) for the product and allow SAC305 type 4, through the API. */
async function approvePb100(request: APIRequestContext, productId: number) {
	const fit = await request.put(`/api/products/${productId}/fit`, {
		headers: bearer(tokenFor('engineer')),
		data: {
			approvals: [{ stencil: 'st-pb100', side: 'top' }],
			alloys: ['SAC305'],
			powderTypes: [4]
		}
	});
	expect(fit.status(), await fit.text()).toBe(200);
	return fit.json();
}

async function overrideAudit(request: APIRequestContext, runId: number) {
	const audit = await request.get('/api/audit?kind=print_run&pageSize=200', {
		headers: bearer(tokenFor('admin'))
	});
	expect(audit.status()).toBe(200);
	const entries = (await audit.json()).entries as {
		action: string;
		recordId: string | null;
		after: Record<string, unknown> | null;
	}[];
	return entries.find((e) => e.action === 'override-product-fit' && e.recordId === String(runId));
}

test.describe('product fit API', () => {
	test('PUT sets the rules (engineers only, unknown stencils named); a run on an unapproved stencil is refused with 422; an engineer override with a note is saved and audited', async ({
		request
	}) => {
		const { line, product, productId } = await lineAndProduct(request, 'A');
		const technician = bearer(tokenFor('technician'));
		const engineer = bearer(tokenFor('engineer'));

		// Who may set the rules, and what is refused.
		const rules = {
			approvals: [{ stencil: 'ST-PB100', side: 'top' }],
			alloys: [],
			powderTypes: []
		};
		expect(
			(
				await request.put(`/api/products/${productId}/fit`, { headers: technician, data: rules })
			).status()
		).toBe(403);
		const unknown = await request.put(`/api/products/${productId}/fit`, {
			headers: engineer,
			data: { ...rules, approvals: [{ stencil: 'ST-PB10', side: 'top' }] }
		});
		expect(unknown.status()).toBe(422);
		expect((await unknown.json()).fields).toEqual([
			{ field: 'approvals[0].stencil', message: expect.stringContaining('did you mean ST-PB100') }
		]);
		const badSide = await request.put(`/api/products/${productId}/fit`, {
			headers: engineer,
			data: { ...rules, approvals: [{ stencil: 'ST-PB100', side: 'left' }] }
		});
		expect(badSide.status()).toBe(400);
		expect(
			(await request.put('/api/products/99999999/fit', { headers: engineer, data: rules })).status()
		).toBe(404);
		expect(await approvePb100(request, productId)).toMatchObject({
			product,
			approvals: [{ stencilName: 'ST-PB100', side: 'top' }],
			alloys: ['SAC305'],
			powderTypes: [4]
		});
		const listed = await request.get('/api/products/fit', { headers: bearer(tokenFor('viewer')) });
		expect((await listed.json()).products).toContainEqual(
			expect.objectContaining({ product, productId, alloys: ['SAC305'] })
		);

		// A stencil not approved for the product: 422 naming the field and the reason.
		const run = {
			line,
			product,
			stencil: 'ST-SH220',
			pasteLot: 'PL-2026-0412',
			parameters: ON_TARGET
		};
		const refused = await request.post('/api/print-runs', { headers: technician, data: run });
		expect(refused.status()).toBe(422);
		const body = await refused.json();
		expect(body.fields).toContainEqual({
			field: 'stencil',
			message: `stencil ST-SH220 is not approved for ${product} (approved: ST-PB100 (top)) (an engineer can override with a reason)`
		});
		expect(body.refusals).toEqual([
			expect.objectContaining({ field: 'stencil', reason: 'stencil-not-approved' })
		]);

		// A technician's note overrides nothing.
		const technicianNote = await request.post('/api/print-runs', {
			headers: technician,
			data: { ...run, overrideReason: 'rush' }
		});
		expect(technicianNote.status()).toBe(422);
		expect((await technicianNote.json()).fields.map((f: { field: string }) => f.field)).toContain(
			'overrideReason'
		);
		const none = await request.get(`/api/print-runs?line=${line}`, { headers: engineer });
		expect((await none.json()).runs).toEqual([]);

		// An engineer's note: 201, the note on the run, an audit entry of its own.
		const overridden = await request.post('/api/print-runs', {
			headers: engineer,
			data: { ...run, overrideReason: 'trial build on the hub stencil' }
		});
		expect(overridden.status(), await overridden.text()).toBe(201);
		const started = await overridden.json();
		expect(started.warnings).toContainEqual(
			expect.stringMatching(
				/^stencil ST-SH220 is not approved for .*; used on the engineer's override: trial build on the hub stencil$/
			)
		);
		const saved = await request.get(`/api/print-runs/${started.id}`, { headers: engineer });
		expect((await saved.json()).overrideReason).toBe('trial build on the hub stencil');
		const entry = await overrideAudit(request, started.id);
		expect(entry?.after).toMatchObject({
			note: 'trial build on the hub stencil',
			product,
			refusals: [{ field: 'stencil', reason: 'stencil-not-approved' }]
		});
		expect(
			(await request.post(`/api/print-runs/${started.id}/end`, { headers: engineer })).status()
		).toBe(200);
	});
});

async function openRunForm(page: Page, line: string, product: string) {
	await page.goto(`/print-runs/new?line=${line}&product=${product}`);
	await expect(page.locator('form[data-hydrated="true"]')).toHaveCount(1);
	await page.locator('#field-stencil').fill('ST-SH220');
	await page.locator('#field-stencil').press('Enter');
	await page.locator('#field-pasteLot').fill('PL-2026-0412');
	await page.locator('#field-pasteLot').press('Enter');
}

test.describe('product fit in the run form', () => {
	test('a technician is refused with the reason; an engineer overrides with a note, which the audit page shows', async ({
		page,
		request
	}) => {
		const { line, product, productId } = await lineAndProduct(request, 'F');
		await approvePb100(request, productId);

		await signInAs(page, 'technician');
		await openRunForm(page, line, product);
		await expect(page.getByTestId('run-checks')).toContainText(
			`Refused: stencil ST-SH220 is not approved for ${product} (approved: ST-PB100 (top))`
		);
		await expect(page.locator('#field-overrideReason')).toHaveCount(0);
		await page.getByRole('button', { name: 'Start run' }).click();
		await expect(page.locator('#field-stencil-error')).toContainText(`not approved for ${product}`);
		await expect(page).toHaveURL(/\/print-runs\/new/);

		await page.context().clearCookies();
		await signInAs(page, 'engineer');
		await openRunForm(page, line, product);
		const note = page.getByLabel('Engineer override: why use this stencil anyway?');
		await expect(note).toBeVisible();
		await note.fill('first article on the hub stencil, checked by SPI');
		await expect(page.getByTestId('run-checks')).toContainText('used on your override');
		await page.getByRole('button', { name: 'Start run' }).click();
		await expect(page).toHaveURL(/\/print-runs\/\d+\?started=1/);
		const runId = Number(new URL(page.url()).pathname.split('/').pop());
		const entry = await overrideAudit(request, runId);
		expect(entry?.after).toMatchObject({
			note: 'first article on the hub stencil, checked by SPI'
		});
		await page.getByRole('button', { name: 'End run now' }).click();
		await expect(page.getByText('Run ended.')).toBeVisible();

		await page.context().clearCookies();
		await signInAs(page, 'admin');
		await page.goto('/audit?kind=print_run');
		await expect(
			page.locator('tr', { hasText: 'override-product-fit' }).filter({ hasText: `#${runId}` })
		).toContainText('first article on the hub stencil, checked by SPI');
	});

	test('engineers set the approvals and allowed pastes on the product-fit page', async ({
		page,
		request
	}) => {
		const { product, productId } = await lineAndProduct(request, 'P');
		await signInAs(page, 'engineer');
		await page.goto('/recipes');
		await page.getByRole('link', { name: 'Stencils and pastes per product' }).click();
		const card = page.getByTestId(`fit-${product}`);
		await card.getByLabel('ST-PB100 · bottom').check();
		await card.getByLabel('Allowed alloys (comma between them)').fill('SAC305, SAC0307');
		await card.getByLabel('type 5').check();
		await card.getByRole('button', { name: `Save ${product}` }).click();
		await expect(page.getByText(`Saved the stencils and pastes of ${product}.`)).toBeVisible();
		const fit = await request.get(`/api/products/${productId}/fit`, {
			headers: bearer(tokenFor('viewer'))
		});
		expect(await fit.json()).toMatchObject({
			approvals: [{ stencilName: 'ST-PB100', side: 'bottom' }],
			alloys: ['SAC0307', 'SAC305'],
			powderTypes: [5]
		});
	});
});
