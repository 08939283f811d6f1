import { expect, type APIRequestContext } from '@playwright/test';
import { bearer, tokenFor } from './helpers';

/** The SMT-1 / PB-100 demo recipe's values, on target. */
export const ON_TARGET = {
	squeegeeAngleDeg: 60,
	squeegeeSpeedMmS: 40,
	squeegeePressureKg: 7,
	separationSpeedMmS: 1,
	separationDistanceMm: 2,
	printGapMm: 0,
	bladeLengthMm: 300,
	wipeIntervalPrints: 3,
	printStroke: 'alternating',
	bladeType: 'metal',
	wipeMode: 'wet-vacuum-dry',
	boardSupport: 'pins'
};

/**
 * Start a PB-100 run on SMT-1 (ending any run another test left open there) at a squeegee speed
 * inside the recipe window (30–60 mm/s) but far above the frozen squeegee-speed chart's limits
 * (the demo runs at about 40 mm/s), so the chart stores a signal for it. Returns the run, its open
 * signal and SMT-1's id; the caller ends the run with `endRun`.
 */
export async function startSignallingRun(request: APIRequestContext, squeegeeSpeedMmS: number) {
	const technician = bearer(tokenFor('technician'));
	const open = await (
		await request.get('/api/print-runs?line=SMT-1&open=true', { headers: technician })
	).json();
	for (const run of open.runs)
		await request.post(`/api/print-runs/${run.id}/end`, { headers: technician, data: {} });
	const started = await request.post('/api/print-runs', {
		headers: technician,
		data: {
			line: 'SMT-1',
			product: 'PB-100',
			stencil: 'ST-PB100',
			pasteLot: 'PL-2026-0412',
			parameters: { ...ON_TARGET, squeegeeSpeedMmS }
		}
	});
	expect(started.status(), await started.text()).toBe(201);
	const runId = (await started.json()).id as number;
	const endRun = () =>
		request.post(`/api/print-runs/${runId}/end`, { headers: technician, data: {} });
	return { runId, technician, endRun };
}

/** The open signal the run raised, and SMT-1's line id (asserted to exist). */
export async function signalOfRun(request: APIRequestContext, runId: number) {
	const technician = bearer(tokenFor('technician'));
	const signals = (
		await (await request.get('/api/signals?status=open', { headers: technician })).json()
	).signals;
	const signal = signals.find((s: { pointKey: string }) => s.pointKey === `run:${runId}`);
	expect(signal, 'a signal for the new run').toBeTruthy();
	const lines = (await (await request.get('/api/lines', { headers: technician })).json()).lines;
	const smt1 = lines.find((l: { code: string }) => l.code === 'SMT-1');
	return { signal, lineId: smt1.id as number };
}
