import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
import { bearer, signInAs, tokenFor } from './helpers';

// Real-CAD traps of issue 15 through the API and the stencil page; layers and hand-derived
// figures in reference/gerber/ (README.md there).
const layer = (name: string) => readFileSync(`reference/gerber/${name}`, 'utf8');

test.describe('CAD paste layers', () => {
	test('stroked QFP pads become drawn openings; overlapping pads show the paste area as sum and union', async ({
		page,
		request
	}) => {
		const engineer = bearer(tokenFor('engineer'));
		const create = async (name: string) =>
			(
				await request.post('/api/stencils', {
					headers: engineer,
					data: { name, revision: 'A', thicknessUm: 120, technology: 'laser-stainless' }
				})
			).json();
		const stamp = Date.now() % 1_000_000;

		const qfp = await create(`ST-CAD-QFP-${stamp}`);
		const strokes = await request.post(
			`/api/stencils/${qfp.id}/apertures?format=gerber&fileName=qfp45-strokes.gbr`,
			{ headers: { ...engineer, 'content-type': 'text/plain' }, data: layer('qfp45-strokes.gbr') }
		);
		expect(strokes.status()).toBe(201);
		const imported = await strokes.json();
		expect(imported.count).toBe(44);
		expect(imported.warnings.join('\n')).toContain('2 line-like island(s)');
		const { apertures } = await (
			await request.get(`/api/stencils/${qfp.id}/apertures`, { headers: engineer })
		).json();
		expect(apertures.filter((a: { drawn?: boolean }) => a.drawn === true)).toHaveLength(44);

		const pads = await create(`ST-CAD-OVL-${stamp}`);
		const overlapping = await request.post(
			`/api/stencils/${pads.id}/apertures?format=gerber&fileName=adjacent-overlaps.gbr`,
			{
				headers: { ...engineer, 'content-type': 'text/plain' },
				data: layer('adjacent-overlaps.gbr')
			}
		);
		expect(overlapping.status()).toBe(201);
		const detail = await (
			await request.get(`/api/stencils/${pads.id}`, { headers: engineer })
		).json();
		// Six 0.6 mm² pads; 0.12 + 0.01 mm² shared (reference/gerber/README.md).
		expect(detail.overlaps.pairCount).toBe(2);
		expect(detail.overlaps.sumAreaUm2).toBeCloseTo(3_600_000, 3);
		expect(detail.overlaps.unionAreaUm2).toBeCloseTo(3_470_000, 3);

		await signInAs(page, 'engineer');
		await page.goto(`/stencils/${pads.id}`);
		const card = page.getByTestId('paste-area');
		await expect(card).toContainText('3.470 mm²');
		await expect(card).toContainText('sum of their areas 3.600 mm²');
		await expect(card.getByTestId('overlaps')).toContainText('2 overlapping pairs');
	});
});
