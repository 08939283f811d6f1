import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { linearRegression, predictTe } from '$lib/analysis';
import { openTestDatabase } from '../testing';
import { seedDemoData } from '../seed';
import { predictedTeForStencil, readStencilQuery, stencilWear } from './stencil-evidence';

let t: ReturnType<typeof openTestDatabase>;
let sh220 = 0;
beforeAll(async () => {
	t = openTestDatabase();
	await seedDemoData(t.db);
	sh220 = t.db.$client
		.prepare(`select id from stencils where name = 'ST-SH220'`)
		.pluck()
		.get() as number;
}, 120_000);
afterAll(() => t.close());

describe('stencilWear', () => {
	it('puts each run at the prints made before it and fits TE against them', () => {
		const w = stencilWear(t.db, sh220, 0.05);
		expect(w.points).toHaveLength(24);
		// 12 boards printed per demo run: the k-th run starts after 12·k prints.
		expect(w.points.map((p) => p.printsBefore)).toEqual(
			Array.from({ length: 24 }, (_, k) => 12 * k)
		);
		const line = linearRegression(
			w.points.map((p) => p.printsBefore),
			w.points.map((p) => p.teMean!)
		);
		expect(w.fit!.slope).toBeCloseTo(line.slope, 12);
		expect(w.teDrop!).toBeCloseTo(-line.slope * 12 * 23, 12);
		// The demo's 2 % loss is hidden by run-to-run settings: not flagged at a 5-point limit.
		expect(w.flagged).toBe(false);
	});
	it('groups boards by prints since the last wipe', () => {
		const w = stencilWear(t.db, sh220, 0.05);
		// Every demo board is in a run with a logged interval (2–10): all 288 are grouped.
		expect(w.sinceWipe.reduce((s, g) => s + g.boards, 0)).toBe(288);
		expect(w.sinceWipe[0].printsSinceWipe).toBe(1);
		// The first board of each run is the first print after a wipe: at least 24 there.
		expect(w.sinceWipe[0].boards).toBeGreaterThanOrEqual(24);
		// Invented: deposits grow about 0.8 % per print since the wipe.
		const first = w.sinceWipe[0].teMean!;
		const second = w.sinceWipe[1].teMean!;
		expect(second).toBeGreaterThan(first);
	});
	it('refuses an unknown stencil with 404 and its message (the API answers it as it is)', async () => {
		expect(() => stencilWear(t.db, 999_999, 0.05)).toThrow(
			expect.objectContaining({ status: 404, message: 'No stencil with id 999999.' })
		);
		await expect(predictedTeForStencil(t.db, 999_999, 0.7)).rejects.toMatchObject({
			status: 404,
			message: 'No stencil with id 999999.'
		});
	});
	it('needs three runs with TE', () => {
		const pb = t.db.$client
			.prepare(`select id from stencils where name = 'ST-PB100' and revision = 'A'`)
			.pluck()
			.get() as number;
		const w = stencilWear(t.db, pb, 0.05);
		expect(w.fit).toBeNull();
		expect(w.reason).toMatch(/a trend needs 3/);
	});
});

describe('predictedTeForStencil', () => {
	it('predicts each aperture from the site model of its technology and marks coverage', async () => {
		const p = await predictedTeForStencil(t.db, sh220, 0.7);
		expect(p.technology).toBe('laser-stainless');
		expect(p.model).not.toBeNull();
		expect(p.apertures).toBe(33 * 8 + 40 + 1);
		const worst = p.listed[0];
		expect(worst.predictedTe).toBeCloseTo(predictTe(p.model!.coefficients, worst.areaRatio), 12);
		expect(worst.lower).toBeLessThanOrEqual(worst.predictedTe);
		// The thermal pad (AR 5) is inside the data (it printed); nothing on this stencil is outside.
		expect(p.notCovered).toBe(0);
		// Openings below the learned limit are predicted under the floor.
		const below = p.listed.filter((a) => a.areaRatio < p.learnedMinAreaRatio!).length;
		expect(p.belowFloor).toBe(below);
	});
	it('reads its query strictly', () => {
		expect(() => readStencilQuery(new URL('http://x/?stencil=abc'), false)).toThrow();
		expect(readStencilQuery(new URL('http://x/?stencil=3&drop=0.1'), true)).toEqual({
			stencilId: 3,
			drop: 0.1,
			floor: 0.7
		});
	});
});
