import type { Page } from '@playwright/test';
import { pageRolesFor, type Role } from '../../src/lib/access';

/** Every static page of the signed-in app (dynamic ones are found from these). */
export const STATIC_PAGES = [
	'/',
	'/account',
	'/admin/cfx',
	'/admin/outbox',
	'/admin/tokens',
	'/admin/users',
	'/analysis',
	'/audit',
	'/boards',
	'/charts',
	'/charts/new',
	'/factory',
	'/paste-lots',
	'/recipes',
	'/recipes/edit',
	'/recipes/fit',
	'/recipes/history',
	'/print-runs',
	'/print-runs/new',
	'/print-runs/trends',
	'/signals',
	'/spi',
	'/spi/pareto',
	'/spi/profiles',
	'/spi/upload',
	'/stencil-life',
	'/stencils',
	'/stencils/thresholds',
	'/study',
	'/trace'
];

/** Detail pages: found as the first link of this shape on the list page. */
const DETAIL_LINKS: [string, RegExp][] = [
	['/boards', /^\/boards\/\d+$/],
	['/charts', /^\/charts\/\d+$/],
	['/paste-lots', /^\/paste-lots\/[^/?]+$/],
	['/print-runs', /^\/print-runs\/\d+$/],
	['/spi', /^\/spi\/imports\/\d+$/],
	['/spi/profiles', /^\/spi\/profiles\/\d+$/],
	['/stencil-life', /^\/stencil-life\/\d+$/],
	['/stencils', /^\/stencils\/\d+$/],
	['/', /^\/lines\/[^/?]+$/]
];

/** Static pages plus one of each detail page, for this role (pages it may open). */
export async function everyPage(page: Page, role: Role): Promise<string[]> {
	const out = STATIC_PAGES.filter((p) => pageRolesFor(p).includes(role));
	for (const [list, shape] of DETAIL_LINKS) {
		if (!pageRolesFor(list).includes(role)) continue;
		await page.goto(list);
		const hrefs = await page
			.locator('main a[href]')
			.evaluateAll((as) => as.map((a) => a.getAttribute('href') ?? ''));
		const found = hrefs.map((h) => h.split('#')[0]).find((h) => shape.test(h.split('?')[0]));
		if (found && !out.includes(found)) out.push(found);
	}
	const chart = out.find((p) => /^\/charts\/\d+$/.test(p));
	if (chart && pageRolesFor(`${chart}/settings`).includes(role)) out.push(`${chart}/settings`);
	const stencil = out.find((p) => /^\/stencils\/\d+$/.test(p));
	if (stencil) out.push(`${stencil}/report`);
	if (stencil) {
		const id = stencil.split('/')[2];
		out.push(`/stencils/compare?old=${id}&new=${id}`);
	}
	return out;
}
