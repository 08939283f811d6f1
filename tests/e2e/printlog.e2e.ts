import { expect, test, type APIRequestContext } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

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

async function runsOn(request: APIRequestContext, line: string) {
	const response = await request.get(`/api/print-runs?line=${line}`, {
		headers: bearer(tokenFor('viewer'))
	});
	expect(response.status()).toBe(200);
	return (await response.json()).runs as { id: number }[];
}

test.describe('print-log API', () => {
	test('recipes, paste lots, runs: contract shapes, 422 naming the parameter, nothing half-saved', async ({
		request
	}) => {
		const n = Date.now() % 100000;
		const line = `PL-L${n}`;
		const product = `PL-P${n}`;
		const lot = `E2E-LOT-${n}`;
		const engineer = bearer(tokenFor('engineer'));
		const technician = bearer(tokenFor('technician'));
		expect(
			(
				await request.post('/api/lines', {
					headers: engineer,
					data: { code: line, name: 'e2e line' }
				})
			).status()
		).toBe(201);
		expect(
			(
				await request.post('/api/products', {
					headers: engineer,
					data: { code: product, name: 'e2e board' }
				})
			).status()
		).toBe(201);

		// Recipes: engineers only; an edit is the next version; bad windows are named.
		const recipe = { line, product, parameters: WINDOWS };
		expect(
			(await request.post('/api/recipes', { headers: technician, data: recipe })).status()
		).toBe(403);
		const v1 = await request.post('/api/recipes', { headers: engineer, data: recipe });
		expect(v1.status()).toBe(201);
		expect(await v1.json()).toMatchObject({ line, product, version: 1 });
		const v2 = await request.post('/api/recipes', {
			headers: engineer,
			data: {
				...recipe,
				parameters: { ...WINDOWS, squeegeeSpeedMmS: { min: 30, target: 40, max: 60 } }
			}
		});
		expect((await v2.json()).version).toBe(2);
		const badRecipe = await request.post('/api/recipes', {
			headers: engineer,
			data: {
				...recipe,
				parameters: { ...WINDOWS, squeegeeAngleDeg: { min: 45, target: 60, max: 95 } }
			}
		});
		expect(badRecipe.status()).toBe(400);
		expect((await badRecipe.json()).fields).toContainEqual({
			field: 'parameters.squeegeeAngleDeg.max',
			message: 'must be ≤ 90° (got 95)'
		});

		// Paste lots and their events. An expiry decades ahead is implausible: confirmed on purpose.
		const unconfirmed = await request.post('/api/paste-lots', {
			headers: technician,
			data: {
				lotNumber: lot,
				alloy: 'SAC305',
				powderType: 4,
				expiresOn: '2099-06-30',
				fluxClass: 'ROL0'
			}
		});
		expect(unconfirmed.status()).toBe(422);
		expect(await unconfirmed.json()).toMatchObject({
			needsConfirmation: true,
			fields: [{ field: 'expiresOn' }]
		});
		const created = await request.post('/api/paste-lots', {
			headers: technician,
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
		expect(await created.json()).toMatchObject({
			lotNumber: lot,
			state: 'cold-storage',
			leadBearing: false
		});
		expect(
			(
				await request.post('/api/paste-lots', {
					headers: technician,
					data: {
						lotNumber: lot,
						alloy: 'SAC305',
						powderType: 4,
						expiresOn: '2099-06-30',
						confirmDates: true
					}
				})
			).status()
		).toBe(409);
		const badLot = await request.post('/api/paste-lots', {
			headers: technician,
			data: { lotNumber: 'X', alloy: 'SAC305', powderType: 9, expiresOn: '2099-06-30' }
		});
		expect(badLot.status()).toBe(400);
		expect((await badLot.json()).fields.map((f: { field: string }) => f.field)).toContain(
			'powderType'
		);
		const out = await request.post(`/api/paste-lots/${lot}/events`, {
			headers: technician,
			data: { event: 'out-of-cold-storage', at: '2026-01-05T06:00:00Z' }
		});
		expect(out.status()).toBe(201);
		const opened = await request.post(`/api/paste-lots/${lot}/events`, {
			headers: technician,
			data: { event: 'opened', at: '2026-01-05T12:00:00Z' }
		});
		expect(opened.status()).toBe(201);
		const back = await request.post(`/api/paste-lots/${lot}/events`, {
			headers: technician,
			data: { event: 'returned' }
		});
		expect(back.status()).toBe(422);
		expect((await back.json()).fields[0].message).toContain(
			'opened paste must not go back to cold storage'
		);

		// A deviation without a reason: 422 naming the parameter, and no run is saved.
		const run = {
			line,
			product,
			stencil: 'ST-PB100',
			pasteLot: lot,
			parameters: { ...ON_TARGET, squeegeeAngleDeg: 65 }
		};
		const refused = await request.post('/api/print-runs', { headers: technician, data: run });
		expect(refused.status()).toBe(422);
		const body = await refused.json();
		expect(body.parameters).toEqual(['squeegeeAngleDeg']);
		expect(body.fields[0].field).toBe('deviationReasons.squeegeeAngleDeg');
		expect(body.error).toContain('squeegeeAngleDeg');
		expect(await runsOn(request, line)).toEqual([]);

		// Physically impossible values and unknown codes are named fields too.
		const impossible = await request.post('/api/print-runs', {
			headers: technician,
			data: { ...run, parameters: { ...ON_TARGET, squeegeeSpeedMmS: -5 }, relativeHumidityPct: 120 }
		});
		expect(impossible.status()).toBe(400);
		expect((await impossible.json()).fields.map((f: { field: string }) => f.field).sort()).toEqual([
			'parameters.squeegeeSpeedMmS',
			'relativeHumidityPct'
		]);
		const unknown = await request.post('/api/print-runs', {
			headers: technician,
			data: { ...run, stencil: 'NO-SUCH', deviationReasons: { squeegeeAngleDeg: 'x' } }
		});
		expect(unknown.status()).toBe(422);
		expect((await unknown.json()).fields).toContainEqual(
			expect.objectContaining({ field: 'stencil' })
		);
		expect(await runsOn(request, line)).toEqual([]);

		// With the reason: 201 with exactly the contract's deviation shape.
		const saved = await request.post('/api/print-runs', {
			headers: technician,
			data: {
				...run,
				startedAt: '2026-01-05T13:00:00Z',
				deviationReasons: { squeegeeAngleDeg: 'trial' }
			}
		});
		expect(saved.status()).toBe(201);
		const savedBody = await saved.json();
		expect(savedBody.id).toEqual(expect.any(Number));
		expect(savedBody.deviations).toEqual([
			{ parameter: 'squeegeeAngleDeg', value: 65, min: 45, max: 60 }
		]);

		// One open run per line; end before start refused; then ended.
		const second = await request.post('/api/print-runs', {
			headers: technician,
			data: { ...run, parameters: ON_TARGET }
		});
		expect(second.status()).toBe(409);
		expect((await second.json()).fields[0]).toMatchObject({ field: 'line' });
		const detail = await request.get(`/api/print-runs/${savedBody.id}`, {
			headers: bearer(tokenFor('quality'))
		});
		expect(await detail.json()).toMatchObject({
			id: savedBody.id,
			line,
			recipeVersion: 2,
			pasteLot: lot,
			endedAt: null
		});
		const early = await request.post(`/api/print-runs/${savedBody.id}/end`, {
			headers: technician,
			data: { endedAt: '2026-01-05T12:00:00Z' }
		});
		expect(early.status()).toBe(422);
		expect((await early.json()).fields[0].field).toBe('endedAt');
		const ended = await request.post(`/api/print-runs/${savedBody.id}/end`, {
			headers: technician,
			data: { endedAt: '2026-01-05T15:00:00Z', boardsPrinted: 200 }
		});
		expect(ended.status()).toBe(200);
		expect(await ended.json()).toMatchObject({
			endedAt: '2026-01-05T15:00:00.000Z',
			boardsPrinted: 200
		});

		// Lists, filters, CSV and trends.
		const listed = await request.get(
			`/api/print-runs?line=${line}&product=${product}&from=2026-01-05&to=2026-01-05`,
			{ headers: bearer(tokenFor('viewer')) }
		);
		expect((await listed.json()).runs.map((r: { id: number }) => r.id)).toEqual([savedBody.id]);
		const csv = await request.get(`/api/print-runs/export.csv?line=${line}`, {
			headers: bearer(tokenFor('viewer'))
		});
		expect(csv.headers()['content-type']).toContain('text/csv');
		expect((await csv.text()).split('\r\n')[0]).toContain('squeegeeAngleDeg');
		const trends = await request.get(`/api/print-runs/trends?line=${line}&product=${product}`, {
			headers: bearer(tokenFor('viewer'))
		});
		expect((await trends.json()).parameters[0]).toMatchObject({
			key: 'squeegeeAngleDeg',
			window: WINDOWS.squeegeeAngleDeg
		});
		expect(
			(
				await request.post('/api/print-runs', { headers: bearer(tokenFor('viewer')), data: run })
			).status()
		).toBe(403);
		expect(
			(
				await request.post(`/api/print-runs/${savedBody.id}/end`, {
					headers: bearer(tokenFor('quality'))
				})
			).status()
		).toBe(403);
	});
});

test.describe('stencil-life API', () => {
	test('GET lists life figures; POST entries: 201 with the stored entry, 401, 403, 422 with errors, 404', async ({
		request
	}) => {
		const name = `ST-LIFE-${Date.now() % 100000}`;
		const engineer = bearer(tokenFor('engineer'));
		const technician = bearer(tokenFor('technician'));
		const created = await request.post('/api/stencils', {
			headers: engineer,
			data: {
				name,
				revision: 'A',
				thicknessUm: 100,
				technology: 'laser-stainless',
				ratedLifePrints: 50000
			}
		});
		expect(created.status()).toBe(201);
		const { id } = await created.json();
		const entries = `/api/stencil-life/${id}/entries`;

		// Who may call: anyone signed in reads, viewers and quality do not write.
		expect((await request.get('/api/stencil-life')).status()).toBe(401);
		expect(
			(await request.post(entries, { data: { kind: 'cleaning', detail: 'IPA wipe' } })).status()
		).toBe(401);
		expect(
			(
				await request.post(entries, {
					headers: bearer(tokenFor('viewer')),
					data: { kind: 'cleaning', detail: 'IPA wipe' }
				})
			).status()
		).toBe(403);
		expect(
			(
				await request.post(entries, {
					headers: bearer(tokenFor('quality')),
					data: { kind: 'cleaning', detail: 'IPA wipe' }
				})
			).status()
		).toBe(403);

		// Tension readings in N/cm: stored and returned, the low one reported.
		const tension = await request.post(entries, {
			headers: technician,
			data: {
				kind: 'tension',
				readingsNPerCm: [38, 34.5, 40],
				note: 'quarterly check',
				at: '2026-03-02T08:00:00Z'
			}
		});
		expect(tension.status()).toBe(201);
		const stored = await tension.json();
		expect(stored.entry).toMatchObject({
			stencilId: id,
			kind: 'tension',
			readingsNPerCm: [38, 34.5, 40],
			note: 'quarterly check',
			at: '2026-03-02T08:00:00.000Z'
		});
		expect(stored.entry.id).toEqual(expect.any(Number));
		expect(stored.tension).toMatchObject({
			minimumNPerCm: 34.5,
			meanNPerCm: 37.5,
			pass: false,
			low: [{ index: 1, valueNPerCm: 34.5 }]
		});
		const cleaned = await request.post(entries, {
			headers: technician,
			data: { kind: 'cleaning', detail: 'ultrasonic, water-based cleaner' }
		});
		expect(cleaned.status()).toBe(201);
		expect((await cleaned.json()).entry).toMatchObject({
			kind: 'cleaning',
			detail: 'ultrasonic, water-based cleaner'
		});
		const state = await request.post(entries, {
			headers: technician,
			data: { kind: 'state', toState: 'out-for-cleaning' }
		});
		expect(state.status()).toBe(201);
		expect(await state.json()).toMatchObject({
			entry: { kind: 'state', fromState: 'available', toState: 'out-for-cleaning' },
			stencil: { state: 'out-for-cleaning' }
		});

		// Bad input: 422 { errors: [{ field, message }] } naming each field; nothing stored.
		const cases: [unknown, string][] = [
			[{ kind: 'tension', readingsNPerCm: [38, 350] }, 'readingsNPerCm[1]'],
			[{ kind: 'tension', readingsNPerCm: 'thirty-eight' }, 'readingsNPerCm'],
			[{ kind: 'state', toState: 'in-use' }, 'toState'],
			[{ kind: 'state', toState: 'quarantined' }, 'note'],
			[{ kind: 'inspection', detail: '  ' }, 'detail'],
			[{ kind: 'polished' }, 'kind'],
			[{ kind: 'cleaning', detail: 'x', at: '2999-01-01T00:00:00Z' }, 'at']
		];
		for (const [data, field] of cases) {
			const refused = await request.post(entries, { headers: technician, data: data as object });
			expect(refused.status(), JSON.stringify(data)).toBe(422);
			const body = await refused.json();
			expect(body.errors).toContainEqual({ field, message: expect.any(String) });
		}
		const notJson = await request.post(entries, {
			headers: { ...technician, 'content-type': 'application/json' },
			data: '{oops'
		});
		expect(notJson.status()).toBe(422);
		expect((await notJson.json()).errors[0].field).toBe('(body)');
		const unknown = await request.post('/api/stencil-life/999999/entries', {
			headers: technician,
			data: { kind: 'cleaning', detail: 'x' }
		});
		expect(unknown.status()).toBe(404);
		expect((await unknown.json()).errors[0]).toMatchObject({ field: 'stencil' });
		expect(
			(
				await request.post('/api/stencil-life/abc/entries', {
					headers: technician,
					data: { kind: 'cleaning', detail: 'x' }
				})
			).status()
		).toBe(404);

		// The list: print count, rated life, share used, state, latest tension.
		const listed = await request.get('/api/stencil-life', { headers: bearer(tokenFor('viewer')) });
		expect(listed.status()).toBe(200);
		const mine = (await listed.json()).stencils.find((s: { id: number }) => s.id === id);
		expect(mine).toMatchObject({
			name,
			state: 'out-for-cleaning',
			printCount: 0,
			ratedLifePrints: 50000,
			lifeUsedPct: 0,
			nearLife: false,
			latestTension: {
				at: '2026-03-02T08:00:00.000Z',
				readingsNPerCm: [38, 34.5, 40],
				minimumNPerCm: 34.5,
				pass: false
			}
		});
		expect(mine.forRun.refuse).toContain('out for cleaning');
	});
});

test.describe('print-run board serial and corrections through the API', () => {
	test('a run keeps its board serial; a correction of stencil, serial and stroke is audited; bad values named', async ({
		request
	}) => {
		const n = Date.now() % 100000;
		const line = `BS-L${n}`;
		const product = `BS-P${n}`;
		const engineer = bearer(tokenFor('engineer'));
		const technician = bearer(tokenFor('technician'));
		await request.post('/api/lines', { headers: engineer, data: { code: line, name: 'e2e line' } });
		await request.post('/api/products', {
			headers: engineer,
			data: { code: product, name: 'e2e board' }
		});
		await request.post('/api/recipes', {
			headers: engineer,
			data: { line, product, parameters: WINDOWS }
		});
		const run = {
			line,
			product,
			stencil: 'ST-PB100',
			pasteLot: 'PL-2026-0412',
			parameters: ON_TARGET,
			startedAt: '2026-01-06T06:00:00Z'
		};
		const badSerial = await request.post('/api/print-runs', {
			headers: technician,
			data: { ...run, boardSerial: 'FW\u00071' }
		});
		expect(badSerial.status()).toBe(400);
		expect((await badSerial.json()).fields).toEqual([
			{
				field: 'boardSerial',
				message: 'must contain only printable characters: U+0007 at position 3 is not'
			}
		]);
		expect(await runsOn(request, line)).toEqual([]);
		const saved = await request.post('/api/print-runs', {
			headers: technician,
			data: { ...run, boardSerial: ']C1Fw-BS-0001' }
		});
		expect(saved.status()).toBe(201);
		const { id } = await saved.json();
		const detail = await (
			await request.get(`/api/print-runs/${id}`, { headers: bearer(tokenFor('viewer')) })
		).json();
		expect(detail.boardSerial).toBe('Fw-BS-0001');

		const stroke = await request.post(`/api/print-runs/${id}/corrections`, {
			headers: technician,
			data: {
				reason: 'scanned the wrong board',
				boardSerial: 'Fw-BS-0002',
				parameters: { printStroke: 'front-to-back' }
			}
		});
		expect(stroke.status()).toBe(422);
		expect((await stroke.json()).fields).toContainEqual(
			expect.objectContaining({ field: 'deviationReasons.printStroke' })
		);
		const early = await request.post(`/api/print-runs/${id}/corrections`, {
			headers: technician,
			data: { reason: 'times', endedAt: '2026-01-06T05:00:00Z', stencil: 'ST-NOPE' }
		});
		expect(early.status()).toBe(422);
		expect((await early.json()).fields.map((f: { field: string }) => f.field)).toEqual([
			'endedAt',
			'stencil'
		]);
		const corrected = await request.post(`/api/print-runs/${id}/corrections`, {
			headers: technician,
			data: {
				reason: 'scanned the wrong board',
				boardSerial: 'Fw-BS-0002',
				bladeCode: 'BL-300-09',
				endedAt: '2026-01-06T07:00:00Z',
				parameters: { printStroke: 'front-to-back' },
				deviationReasons: { printStroke: 'one-way trial' }
			}
		});
		expect(corrected.status()).toBe(200);
		expect(await corrected.json()).toMatchObject({
			boardSerial: 'Fw-BS-0002',
			bladeCode: 'BL-300-09',
			endedAt: '2026-01-06T07:00:00.000Z',
			corrections: 1
		});
		const csv = await (
			await request.get(`/api/print-runs/export.csv?line=${line}`, {
				headers: bearer(tokenFor('viewer'))
			})
		).text();
		const [header, row] = csv.split('\r\n');
		expect(row.split(',')[header.split(',').indexOf('boardSerial')]).toBe('Fw-BS-0002');
	});
});

test.describe('print-log pages without JavaScript', () => {
	test.use({ javaScriptEnabled: false });

	test('the run form posts as a plain form: a run is started from the recipe targets and ended', async ({
		page
	}) => {
		await page.goto('/signin');
		await page.getByLabel('E-mail').fill('technician@fenmoor.example');
		await page.getByLabel('Password').fill('demo-technician-pass');
		await page.getByRole('button', { name: 'Sign in' }).click();
		await expect(page.getByTestId('viewer')).toContainText('Line technician', {
			useInnerText: false
		});
		await page.goto('/print-runs/new?line=SMT-3&product=LM-48');
		await expect(page.locator('#field-squeegeeSpeedMmS')).toHaveValue('30');
		await page.locator('#field-stencil').fill('ST-PB100');
		await page.locator('#field-pasteLot').fill('pl-2026-0412');
		await page.locator('#field-boardSerial').fill('FW-LM48-000777');
		await page.getByRole('button', { name: 'Start run' }).click();
		await expect(page).toHaveURL(/\/print-runs\/\d+\?started=1/);
		await expect(page.getByText('Run started.')).toBeVisible();
		await expect(page.getByText('version 1', { exact: true })).toBeVisible();
		await expect(page.getByTestId('run-board-serial')).toHaveText('FW-LM48-000777');

		// A correction of a non-numeric field posts as a plain form too.
		await page.getByText('Correct values…').click();
		await page.locator('#c-boardSerial').fill('FW-LM48-000778');
		await page.locator('#c-reason').fill('label misread');
		await page.getByRole('button', { name: 'Save correction' }).click();
		await expect(
			page.getByText('Correction saved; the audit log keeps the previous values.')
		).toBeVisible();
		await expect(page.getByTestId('run-board-serial')).toHaveText('FW-LM48-000778');
		await expect(page.getByTestId('history-changes')).toContainText(
			'Board serial: FW-LM48-000777 → FW-LM48-000778'
		);
		await page.locator('#end-boards').fill('25');
		await page.getByRole('button', { name: 'End run now' }).click();
		await expect(page.getByText('Run ended.')).toBeVisible();
	});
});

test.describe('recipe edit page', () => {
	test('the ideal cycle time is shown in seconds, saved, refused when out of range, kept when blank', async ({
		page,
		request
	}) => {
		const n = Date.now() % 100000;
		const line = `CT-L${n}`;
		const product = `CT-P${n}`;
		const engineer = bearer(tokenFor('engineer'));
		for (const [path, code] of [
			['/api/lines', line],
			['/api/products', product]
		]) {
			const made = await request.post(path, { headers: engineer, data: { code, name: 'e2e' } });
			expect(made.status()).toBe(201);
		}
		const v1 = await request.post('/api/recipes', {
			headers: engineer,
			data: { line, product, idealCycleTimeS: 20, parameters: WINDOWS }
		});
		expect(v1.status()).toBe(201);
		const current = async () => {
			const res = await request.get(`/api/recipes?line=${line}&product=${product}`, {
				headers: engineer
			});
			return (await res.json()).recipes[0] as { version: number; idealCycleTimeS: number | null };
		};

		await signInAs(page, 'engineer');
		await page.goto(`/recipes/edit?line=${line}&product=${product}`);
		const field = page.getByLabel('Ideal cycle time (s per board)');
		await expect(field).toHaveValue('20');

		// Zero passes the browser's min but not the recipe schema: named at the field, nothing saved.
		await field.fill('0');
		await page.getByRole('button', { name: 'Save as new version' }).click();
		await expect(page.locator('#idealCycleTimeS-error')).toBeVisible();
		await expect(field).toHaveAttribute('aria-invalid', 'true');
		expect(await current()).toMatchObject({ version: 1, idealCycleTimeS: 20 });

		await field.fill('24.5');
		await page.getByRole('button', { name: 'Save as new version' }).click();
		await expect(page).toHaveURL(/\/recipes\/history\?.*saved=2/);
		expect(await current()).toMatchObject({ version: 2, idealCycleTimeS: 24.5 });

		// Blank keeps the current version's value, as POST /api/recipes does when it is left out.
		await page.goto(`/recipes/edit?line=${line}&product=${product}`);
		await expect(field).toHaveValue('24.5');
		await field.fill('');
		await page.getByLabel('Squeegee speed max').fill('90');
		await page.getByRole('button', { name: 'Save as new version' }).click();
		await expect(page).toHaveURL(/\/recipes\/history\?.*saved=3/);
		expect(await current()).toMatchObject({ version: 3, idealCycleTimeS: 24.5 });
	});
});
