import { expect, test } from '@playwright/test';
import { bearer, tokenFor } from './helpers';

// The demo's frozen squeegee-speed chart (PB-100 on SMT-1) judges every run logged on that line.
test('a print run far off the frozen limits raises a signal on its chart as soon as it is logged', async ({ request }) => {
	const technician = bearer(tokenFor('technician'));
	const viewer = bearer(tokenFor('viewer'));
	const charts = (await (await request.get('/api/charts', { headers: viewer })).json()).charts as {
		id: number;
		name: string;
	}[];
	const speedChart = charts.find((c) => c.name.startsWith('Squeegee speed · PB-100 · SMT-1'));
	expect(speedChart, 'demo speed chart').toBeDefined();

	// One open run per line: end whatever is open on SMT-1 first.
	const runs = (await (await request.get('/api/print-runs?line=SMT-1', { headers: viewer })).json()).runs as {
		id: number;
		endedAt: string | null;
	}[];
	for (const run of runs.filter((r) => !r.endedAt)) {
		expect((await request.post(`/api/print-runs/${run.id}/end`, { headers: technician })).status()).toBe(200);
	}

	const signalsFor = async () =>
		(await (await request.get(`/api/signals?chart=${speedChart!.id}`, { headers: viewer })).json())
			.signals as { pointKey: string; rule: string }[];
	const before = await signalsFor();

	// Every parameter on its recipe target but the squeegee speed.
	const recipes = (await (await request.get('/api/recipes?line=SMT-1&product=PB-100', { headers: viewer })).json())
		.recipes as { parameters: Record<string, unknown> }[];
	const recipeTargets = Object.fromEntries(
		Object.entries(recipes[0].parameters).map(([key, spec]) => {
			const window = spec as { target?: unknown; value?: unknown };
			return [key, typeof spec === 'object' && spec ? (window.target ?? window.value) : spec];
		})
	);
	const logged = await request.post('/api/print-runs', {
		headers: technician,
		data: {
			line: 'SMT-1',
			product: 'PB-100',
			stencil: 'ST-PB100',
			pasteLot: 'PL-2026-0412',
			parameters: { ...recipeTargets, squeegeeSpeedMmS: 95 },
			deviationReasons: { squeegeeSpeedMmS: 'e2e: deliberately fast stroke' }
		}
	});
	expect(logged.status(), await logged.text()).toBe(201);
	const runId = (await logged.json()).id;

	const after = await signalsFor();
	expect(after.length).toBeGreaterThan(before.length);
	// Signals name their point: a print-parameter chart's points are runs ("run:<id>").
	expect(after.filter((s) => s.pointKey === `run:${runId}`).map((s) => s.rule)).toContain('we-1');
	await request.post(`/api/print-runs/${runId}/end`, { headers: technician });
});
