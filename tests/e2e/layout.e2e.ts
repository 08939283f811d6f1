import { expect, test } from '@playwright/test';
import { signInAs } from './helpers';
import { everyPage } from './every-page';

// Issue 13, finding 7: every page usable on a desktop and on 1024 px and 820 px tablets, with no
// sideways scrolling of the page (wide tables scroll inside their own card).
const WIDTHS = [1280, 1024, 820];

test.describe.configure({ timeout: 300_000 });

for (const role of ['admin', 'technician'] as const) {
	test(`no page scrolls sideways at ${WIDTHS.join(', ')} px (${role})`, async ({ page }) => {
		await signInAs(page, role);
		const pages = await everyPage(page, role);
		const wide: string[] = [];
		for (const width of WIDTHS) {
			await page.setViewportSize({ width, height: 900 });
			for (const path of pages) {
				await page.goto(path);
				await page.waitForLoadState('networkidle');
				const { scrollWidth, clientWidth, culprit } = await page.evaluate(() => {
					const clientWidth = document.documentElement.clientWidth;
					// Name the outermost element that sticks out, to say what to fix.
					let culprit = '';
					const clipped = (el: Element) => {
						for (let a = el.parentElement; a && a !== document.body; a = a.parentElement) {
							if (getComputedStyle(a).overflowX !== 'visible') return true;
						}
						return false;
					};
					for (const el of document.querySelectorAll('body *')) {
						const r = el.getBoundingClientRect();
						if (r.right > clientWidth + 1 && r.width > 0 && !clipped(el)) {
							culprit = `${el.tagName.toLowerCase()}${el.id ? '#' + el.id : ''}.${String(el.className).split(' ').slice(0, 3).join('.')} (${Math.round(r.width)} px)`;
							break;
						}
					}
					return { scrollWidth: document.documentElement.scrollWidth, clientWidth, culprit };
				});
				if (scrollWidth > clientWidth)
					wide.push(`${path} at ${width} px: ${scrollWidth} > ${clientWidth}: ${culprit}`);
			}
		}
		expect(wide).toEqual([]);
	});
}

test('a board page pages its pads with a count and a filter; failing outlines stay thin at any zoom', async ({
	page
}) => {
	await signInAs(page, 'viewer');
	// A demo PB-100 board (other specs add boards of their own, without a U1).
	await page.goto('/boards?serial=FW-PB100-&prefix=1');
	const first = page.locator('main a[href^="/boards/"]').first();
	await first.click();
	await expect(page.getByTestId('pad-table')).toBeVisible();
	const rows = await page.getByTestId('pad-table').locator('tbody tr').count();
	expect(rows).toBeLessThanOrEqual(50);
	await expect(page.getByTestId('pager')).toContainText(/of [\d,]+ pads/);
	await page.getByLabel('Find a pad').fill('U1.');
	await expect(page.getByTestId('pad-table').locator('tbody tr').first()).toContainText('U1');
	// The volume map's outlines: a screen width of a pixel or two, whatever the board size.
	const strokes = await page
		.getByTestId('volume-map')
		.locator('path')
		.evaluateAll((paths) =>
			paths
				.filter((p) => p.getAttribute('stroke-width') !== '0')
				.map((p) => ({
					width: Number(p.getAttribute('stroke-width')),
					effect: p.getAttribute('vector-effect')
				}))
		);
	for (const s of strokes) expect(s).toEqual({ width: 1.5, effect: 'non-scaling-stroke' });
	// The page stays a reasonable height: one page of pads, not thousands of rows.
	const height = await page.evaluate(() => document.documentElement.scrollHeight);
	expect(height).toBeLessThan(6000);
});

test('the stencil page pages its apertures: a page of rows, with count and filter, not thousands', async ({
	page
}) => {
	await signInAs(page, 'viewer');
	await page.goto('/stencils');
	const href = await page
		.locator('main a[href^="/stencils/"]')
		.evaluateAll((as) =>
			as.map((a) => a.getAttribute('href') ?? '').find((h) => /^\/stencils\/\d+$/.test(h))
		);
	expect(href).toBeTruthy();
	await page.goto(href!);
	await page.waitForLoadState('networkidle');
	const rows = await page.locator('main table tbody tr').count();
	expect(rows).toBeLessThan(400);
	const height = await page.evaluate(() => document.documentElement.scrollHeight);
	expect(height).toBeLessThan(8000);
});
