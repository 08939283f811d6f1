import { expect, test } from '@playwright/test';
import { apiJson, signInAs } from './helpers';

type Row = {
	id: number;
	name: string;
	level: string;
	openSignals: number;
	assessment: { headline: string; verdict: string };
};

// Issue 13: one assessment, so the list, each chart page and the API never disagree, and no
// verdict contradicts its own chart (demo data).
test('the charts list and every chart page show the API assessment; none contradicts its chart', async ({
	page,
	request
}) => {
	const { charts } = (await apiJson(request, '/api/charts', 'viewer')) as { charts: Row[] };
	expect(charts.length).toBeGreaterThanOrEqual(3);
	await signInAs(page, 'viewer');
	await page.goto('/charts');
	for (const c of charts) {
		const cell = page.getByTestId(`verdict-${c.id}`);
		await expect(cell, c.name).toHaveAttribute('data-verdict', c.level);
		await expect(cell, c.name).toContainText(c.assessment.headline);
	}
	for (const c of charts) {
		const detail = await apiJson(request, `/api/charts/${c.id}`, 'viewer');
		expect(detail.assessment.verdict, c.name).toBe(c.level);
		if (detail.capability) expect(detail.capability.level, c.name).toBe(c.level);
		const flagged = new Set(detail.violations.flatMap((v: { points: number[] }) => v.points)).size;
		if (flagged > 0 || c.openSignals > 0)
			expect(c.level, `${c.name}: ${flagged} points flagged`).toBe('not-stable');
		await page.goto(`/charts/${c.id}`);
		const reading = page.getByTestId('capability-reading');
		await expect(reading, c.name).toHaveAttribute('data-verdict', c.level);
		await expect(page.getByTestId('capability-verdict'), c.name).toHaveText(
			`${c.assessment.headline}.`
		);
		// Chart labels never overlap: the histogram's spec labels have disjoint boxes.
		const boxes = await page
			.getByTestId('capability')
			.locator('svg text.font-semibold')
			.evaluateAll((ts) =>
				ts
					.map((t) => t.getBoundingClientRect())
					.map((r) => ({ l: r.left, r: r.right, t: r.top, b: r.bottom }))
			);
		for (let i = 0; i < boxes.length; i++)
			for (let j = i + 1; j < boxes.length; j++) {
				const [p, q] = [boxes[i], boxes[j]];
				const overlap = p.l < q.r && q.l < p.r && p.t < q.b && q.t < p.b;
				expect(overlap, `${c.name}: spec labels ${i} and ${j} overlap`).toBe(false);
			}
		// "Highly capable", the old Cpk-only words, appear nowhere.
		await expect(page.locator('main')).not.toContainText('Highly capable');
	}
});

test('the squeegee-speed chart: not stable, open signals listed, observed out-of-spec shown', async ({
	page,
	request
}) => {
	const { charts } = (await apiJson(request, '/api/charts', 'viewer')) as { charts: Row[] };
	const speed = charts.find((c) => c.name.startsWith('Squeegee speed'));
	expect(speed).toBeDefined();
	expect(speed?.level).toBe('not-stable');
	await signInAs(page, 'viewer');
	await page.goto(`/charts/${speed?.id}`);
	await expect(page.getByTestId('capability-verdict')).toHaveText(
		'Not stable, capability not assessed.'
	);
	await expect(page.getByTestId('capability-reading')).toContainText('open signal');
	await expect(page.getByTestId('ppm-observed')).not.toHaveText(/^0 ppm/);
	await expect(page.getByTestId('ppm-expected')).toContainText('overall spread');
	await expect(page.getByTestId('cpk-lower')).not.toHaveText('–');
	// Limits with a history: which version is in force, since when, from how many subgroups.
	const inForce = page.getByTestId('limits-in-force');
	await expect(inForce).toContainText('In force: version 1');
	await expect(inForce).toContainText('from 9 subgroups');
	await expect(page.getByText('Preliminary: 9 subgroups, fewer than the 20')).toBeVisible();
});
