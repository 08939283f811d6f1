/**
 * Hostile stencil input over HTTP against the built app (issue 11): every file that asks for too
 * much work is refused before the work (413 naming the line and the limit), every loosely written
 * number is refused naming the line (422), the server answers `/api/health` after each, and a
 * refused replace leaves the stored apertures as they were. A heavy but legal stencil stays
 * readable through the API and its page.
 */
import { expect, test, type APIRequestContext } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

const H = '%FSLAX26Y26*%\n%MOMM*%\n';
const CSV_HEADER = 'refdes,pad,shape,length,width,corner_radius,diameter,x,y,rotation,vertices';

const ringCell = (n: number, r: number) =>
	Array.from({ length: n }, (_, k) => {
		const a = (2 * Math.PI * k) / n;
		return `${(r * Math.cos(a)).toFixed(7)} ${(r * Math.sin(a)).toFixed(7)}`;
	}).join(';');
const circleDraws = (n: number, r: number) =>
	Array.from({ length: n }, (_, k) => {
		const a = (2 * Math.PI * k) / n;
		return `X${Math.round(r * Math.cos(a))}Y${Math.round(r * Math.sin(a))}D01*`;
	}).join('\n');

async function newStencil(request: APIRequestContext, name: string): Promise<number> {
	const created = await request.post('/api/stencils', {
		headers: bearer(tokenFor('engineer')),
		data: {
			name: `${name}-${Date.now() % 1_000_000}`,
			revision: 'A',
			thicknessUm: 120,
			technology: 'laser-stainless'
		}
	});
	expect(created.status()).toBe(201);
	return (await created.json()).id;
}

async function apertureCount(request: APIRequestContext, id: number): Promise<number> {
	const read = await request.get(`/api/stencils/${id}/apertures`, {
		headers: bearer(tokenFor('viewer'))
	});
	expect(read.status()).toBe(200);
	return (await read.json()).apertures.length;
}

async function healthy(request: APIRequestContext) {
	const health = await request.get('/api/health');
	expect(health.status()).toBe(200);
}

/** Send a file as the raw body (what scripts do), replacing the stencil's apertures. */
function postRaw(
	request: APIRequestContext,
	id: number,
	fileName: string,
	body: string | Buffer,
	query = ''
) {
	return request.post(`/api/stencils/${id}/apertures?mode=replace&fileName=${fileName}${query}`, {
		headers: { ...bearer(tokenFor('engineer')), 'content-type': 'application/octet-stream' },
		data: typeof body === 'string' ? Buffer.from(body, 'utf8') : body
	});
}

test.describe('hostile stencil input', () => {
	let id: number;
	test.beforeAll(async ({ request }) => {
		id = await newStencil(request, 'HOSTILE');
		const seeded = await postRaw(
			request,
			id,
			'seed.gbr',
			`${H}%ADD10C,0.3*%\n%ADD11R,1X0.5*%\nD10*\nX0Y0D03*\nX2000000Y0D03*\nD11*\nX4000000Y0D03*\nM02*\n`
		);
		expect(seeded.status()).toBe(201);
		expect(await apertureCount(request, id)).toBe(3);
	});

	const tooMuchWork: {
		name: string;
		file: string;
		body: () => string;
		line: number;
		message: RegExp;
	}[] = [
		{
			name: 'a 91-byte step-and-repeat asking for 10,000 × 10,000 copies',
			file: 'sr.gbr',
			body: () => `${H}%SRX10000Y10000I1J1*%\n%ADD10C,0.1*%\nD10*\nX0Y0D03*\nM02*\n`,
			line: 3,
			message:
				/^line 3, %SR: step-and-repeat asks for 100,000,000 copies; the limit is 50,000 openings per layer$/
		},
		{
			name: 'a step-and-repeat asking for 1,000 × 1,000 copies',
			file: 'sr1000.gbr',
			body: () => `${H}%SRX1000Y1000I1J1*%\n%ADD10C,0.1*%\nD10*\nX0Y0D03*\nM02*\n`,
			line: 3,
			message: /step-and-repeat asks for 1,000,000 copies/
		},
		{
			name: 'a region outline of 32,000 vertices',
			file: 'outline.gbr',
			body: () => `${H}G36*\nX1000000Y0D02*\n${circleDraws(32_000, 1_000_000)}\nG37*\nM02*\n`,
			line: 3,
			message:
				/^line 3, G36: contour 1 has more than 1,000 vertices .* the limit is 1,000 per outline$/
		},
		{
			name: 'a region of full-circle arcs cut into too many chords',
			file: 'arcs.gbr',
			body: () =>
				`${H}G75*\nG36*\nX50000000Y0D02*\n${'G03X50000000Y0I-50000000J0D01*\n'.repeat(40)}G37*\nM02*\n`,
			line: 4,
			message: /contour 1 has more than 1,000 vertices \(arcs counted by their chords\)/
		},
		{
			name: 'a macro with a huge primitive count',
			file: 'macro.gbr',
			body: () =>
				`${H}%AMMANY*\n${'1,1,0.1,0,0*\n'.repeat(5_000)}%\n%ADD10MANY*%\nD10*\nX0Y0D03*\nM02*\n`,
			line: 3,
			message:
				/^line 3, %AMMANY: the macro has more than 100 primitives; the limit is 100 per macro$/
		},
		{
			name: 'a long line with no newline and no "*"',
			file: 'long.gbr',
			body: () => `${H}%ADD10C,0.1*%\nD10*\nX${'7'.repeat(1_000_000)}`,
			line: 5,
			message: /^line 5, command: a command runs past 65,536 characters without its closing "\*"/
		}
	];
	for (const c of tooMuchWork)
		test(`413: ${c.name}`, async ({ request }) => {
			const refused = await postRaw(request, id, c.file, c.body());
			expect(refused.status()).toBe(413);
			const answer = await refused.json();
			expect(answer.error).toContain('nothing was imported');
			expect(answer.errors[0]).toMatchObject({ file: c.file, line: c.line });
			expect(answer.errors[0].message).toMatch(c.message);
			await healthy(request);
			expect(await apertureCount(request, id)).toBe(3);
		});

	const looseNumbers: {
		name: string;
		file: string;
		body: () => string | Buffer;
		line: number;
		message: RegExp;
	}[] = [
		{
			name: 'a circle of 1e308 (was read as 1 mm)',
			file: 'c1e308.gbr',
			body: () => `${H}%ADD10C,1e308*%\nD10*\nX0Y0D03*\nM02*\n`,
			line: 3,
			message: /^line 3, %ADD10: parameter 1 "1e308" is not a plain decimal number/
		},
		{
			name: 'a circle of 0x10',
			file: 'hex.gbr',
			body: () => `${H}%ADD10C,0x10*%\nD10*\nX0Y0D03*\nM02*\n`,
			line: 3,
			message: /^line 3, %ADD10: parameter 1 "0x10" is not a plain decimal number/
		},
		{
			name: 'a 40-digit coordinate (was clamped without a word)',
			file: 'digits.gbr',
			body: () => `${H}%ADD10C,0.1*%\nD10*\nX${'1234567890'.repeat(4)}Y0D03*\nM02*\n`,
			line: 5,
			message:
				/^line 5, X \(column 1\): coordinate has 40 digits; %FS \(line 1\) declares 2 integer \+ 6 decimal digits$/
		},
		{
			name: 'NUL bytes',
			file: 'nul.gbr',
			body: () => `${H}%ADD10C,0.1*%\nD1\u00000*\nX0Y0D03*\nM02*\n`,
			line: 4,
			message: /^line 4, column 3: binary data \(U\+0000\)/
		},
		{
			name: 'invalid UTF-8',
			file: 'latin1.gbr',
			body: () =>
				Buffer.concat([
					Buffer.from(`${H}G04 caf`),
					Buffer.from([0xe9, 0x2a, 0x0a]),
					Buffer.from('M02*\n')
				]),
			line: 3,
			message: /^line 3, column 8: binary data \(U\+FFFD\)/
		},
		{
			name: 'an aperture CSV with a rotation of 1e308',
			file: 'rot.csv',
			body: () => `${CSV_HEADER}\nU1,1,circle,,,,0.3,0,0,1e308,\n`,
			line: 2,
			message: /^line 2, rotation: 1e\+308° is outside -360\.\.360°$/
		}
	];
	for (const c of looseNumbers)
		test(`422: ${c.name}`, async ({ request }) => {
			const refused = await postRaw(
				request,
				id,
				c.file,
				c.body(),
				c.file.endsWith('.csv') ? '&unit=mm' : ''
			);
			expect(refused.status()).toBe(422);
			const answer = await refused.json();
			expect(answer.errors[0]).toMatchObject({ file: c.file, line: c.line });
			expect(answer.errors[0].message).toMatch(c.message);
			await healthy(request);
			expect(await apertureCount(request, id)).toBe(3);
		});

	test('400: a JSON aperture with a rotation of 1e308 names the field', async ({ request }) => {
		const refused = await request.post(`/api/stencils/${id}/apertures`, {
			headers: bearer(tokenFor('engineer')),
			data: {
				mode: 'replace',
				apertures: [
					{ refdes: 'U1', pad: '1', shape: 'circle', diameterUm: 300, rotationDeg: 1e308 }
				]
			}
		});
		expect(refused.status()).toBe(400);
		expect((await refused.json()).fields).toEqual([
			{ field: 'apertures[0].rotationDeg', message: '1e+308° is outside -360..360°' }
		]);
		await healthy(request);
		expect(await apertureCount(request, id)).toBe(3);
	});

	test('413: a JSON list of 501 polygons of 1,000 vertices is counted before it is validated', async ({
		request
	}) => {
		const ring = Array.from({ length: 1_000 }, (_, k) => [
			Math.round(400 * Math.cos((2 * Math.PI * k) / 1_000)),
			Math.round(400 * Math.sin((2 * Math.PI * k) / 1_000))
		]);
		const refused = await request.post(`/api/stencils/${id}/apertures`, {
			headers: bearer(tokenFor('engineer')),
			data: {
				mode: 'replace',
				apertures: Array.from({ length: 501 }, (_, i) => ({
					refdes: `P${i}`,
					pad: '1',
					shape: 'polygon',
					verticesUm: ring,
					xUm: i * 1000
				}))
			}
		});
		expect(refused.status()).toBe(413);
		expect(await refused.json()).toEqual({
			error: 'The request holds 501,000 polygon vertices; the limit is 500,000 per import.',
			fields: [
				{ field: 'apertures', message: '501,000 polygon vertices; the limit is 500,000 per import' }
			]
		});
		await healthy(request);
		expect(await apertureCount(request, id)).toBe(3);
	});

	test('a heavy but legal stencil: 400 polygons of 1,000 vertices store and read; more vertices are refused', async ({
		request,
		page
	}) => {
		test.setTimeout(180_000);
		const heavy = await newStencil(request, 'HEAVY');
		const cell = ringCell(1_000, 0.4);
		const rows = (n: number, from: number) =>
			Array.from(
				{ length: n },
				(_, i) => `P${from + i},1,polygon,,,,,${(from + i) * 1.5},0,0,${cell}`
			);
		const stored = await postRaw(
			request,
			heavy,
			'heavy.csv',
			`${CSV_HEADER}\n${rows(400, 0).join('\n')}\n`,
			'&unit=mm'
		);
		expect(stored.status()).toBe(201);
		expect((await stored.json()).count).toBe(400);
		await healthy(request);

		// Appending 200 more would take the stencil past 500,000 polygon vertices.
		const more = await request.post(`/api/stencils/${heavy}/apertures?unit=mm&fileName=more.csv`, {
			headers: { ...bearer(tokenFor('engineer')), 'content-type': 'text/csv' },
			data: `${CSV_HEADER}\n${rows(200, 400).join('\n')}\n`
		});
		expect(more.status()).toBe(422);
		expect((await more.json()).errors[0].message).toBe(
			'import, verticesUm: the stencil would hold 600,000 polygon vertices; the limit is 500,000 per stencil'
		);

		// Reads answer with the figures of a regular 1,000-gon of circumradius 400 µm.
		const one = await request.get(`/api/stencils/${heavy}`, {
			headers: bearer(tokenFor('viewer'))
		});
		expect(one.status()).toBe(200);
		const summary = (await one.json()).summary;
		expect(summary.total).toBe(400);
		expect(summary.smallestOpening.value).toBeCloseTo(800 * Math.cos(Math.PI / 1000), 2);
		expect(await apertureCount(request, heavy)).toBe(400);
		// The page: its server load evaluates the stencil, its map the 400 outlines.
		await signInAs(page, 'viewer');
		const shown = await page.goto(`/stencils/${heavy}`);
		expect(shown?.status()).toBe(200);
		await expect(page.getByRole('heading', { level: 1 })).toContainText('HEAVY');
		await expect(page.getByTestId('map-layer')).toBeVisible({ timeout: 30_000 });
		await healthy(request);
	});
});
