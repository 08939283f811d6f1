import { expect, test, type Locator, type Page } from '@playwright/test';
import { apiJson, bearer, signInAs, tokenFor } from './helpers';

// Issue 13: no chart label overlaps another at the tested widths. Every text of each chart's
// SVG (tick labels, axis titles, annotations) must have a box disjoint from every other's. The
// capability histogram has its own check in capability.e2e.ts; this covers the other charts.

const WIDTHS = [1280, 1024, 820];

/** Pairs of overlapping texts inside `chart` ("'a' / 'b'"), boxes shrunk by half a pixel. */
async function overlappingLabels(chart: Locator): Promise<string[]> {
	return chart.evaluate((root) => {
		const boxes = [...root.querySelectorAll('svg text')]
			.map((t) => ({ text: (t.textContent ?? '').trim(), r: t.getBoundingClientRect() }))
			.filter((b) => b.text !== '' && b.r.width > 0 && b.r.height > 0);
		const out: string[] = [];
		const e = 0.5;
		for (let i = 0; i < boxes.length; i++)
			for (let j = i + 1; j < boxes.length; j++) {
				const [p, q] = [boxes[i].r, boxes[j].r];
				if (
					p.left + e < q.right &&
					q.left + e < p.right &&
					p.top + e < q.bottom &&
					q.top + e < p.bottom
				)
					out.push(`'${boxes[i].text}' / '${boxes[j].text}'`);
			}
		return out;
	});
}

async function checkAtEveryWidth(page: Page, url: string, charts: (page: Page) => Locator[]) {
	for (const width of WIDTHS) {
		await page.setViewportSize({ width, height: 900 });
		await page.goto(url);
		for (const chart of charts(page)) {
			await expect(chart.locator('svg text').first()).toBeVisible();
			expect(await overlappingLabels(chart), `${url} at ${width} px`).toEqual([]);
		}
	}
}

test.describe('chart labels do not overlap at 1280, 1024 and 820 px', () => {
	test.beforeEach(async ({ page }) => {
		await signInAs(page, 'viewer');
	});

	test('analysis: transfer efficiency and parameter scatter', async ({ page }) => {
		await checkAtEveryWidth(page, '/analysis', (p) => [
			p.getByTestId('te-chart'),
			p.getByTestId('scatter-chart').first()
		]);
	});

	test('run report: volume per board', async ({ page, request }) => {
		const trace = await (
			await request.get('/api/trace?serial=FW-SH220-0000001', {
				headers: bearer(tokenFor('viewer'))
			})
		).json();
		await checkAtEveryWidth(page, `/analysis/reports/runs/${trace.boards[0].run.id}`, (p) => [
			p.locator('main')
		]);
	});

	test('run trends and the stencil thickness sweep', async ({ page, request }) => {
		await checkAtEveryWidth(page, '/print-runs/trends?line=SMT-2&product=SH-220', (p) => [
			p.locator('figure:has(svg)').first()
		]);
		const { stencils } = (await apiJson(request, '/api/stencils', 'viewer')) as {
			stencils: { id: number; name: string }[];
		};
		const stencil = stencils.find((s) => s.name === 'ST-SH220')!;
		await checkAtEveryWidth(page, `/stencils/${stencil.id}`, (p) => [p.getByTestId('sweep-chart')]);
	});

	// Found by this check (3 December): on /charts/1 at 1280 px the zone letters A, B and C of the
	// location chart printed over each other where the zones are thinner than a line of text.
	test('a control chart', async ({ page, request }) => {
		const { charts } = (await apiJson(request, '/api/charts', 'viewer')) as {
			charts: { id: number; name: string }[];
		};
		await checkAtEveryWidth(page, `/charts/${charts[0].id}`, (p) => [
			p.getByTestId('location-pane')
		]);
	});
});
