import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { seedDemoData } from '../seed';
import {
	getPasteLot,
	listCurrentRecipes,
	listProductFit,
	listRuns,
	listStencilLife,
	runTrends
} from './index';

let db: Db;
let close: () => void;
beforeEach(() => ({ db, close } = openTestDatabase()));
afterEach(() => close());

describe('print-log demo data', () => {
	it('seeds recipes, lots in every situation and two weeks of runs on the demo stencil', async () => {
		await seedDemoData(db);
		expect(listCurrentRecipes(db).map((r) => `${r.line}/${r.product} v${r.version}`)).toEqual([
			'SMT-1/PB-100 v1',
			'SMT-2/SH-220 v1',
			'SMT-3/LM-48 v1'
		]);
		expect(getPasteLot(db, 'PL-2026-0398')).toMatchObject({
			leadBearing: true,
			state: 'cold-storage'
		});
		expect(getPasteLot(db, 'PL-2025-0977')!.assessment.refuse[0].code).toBe('expired');
		const ready = getPasteLot(db, 'PL-2026-0412')!;
		expect(ready.assessment).toEqual({ refuse: [], warn: [] });
		const runs = listRuns(db, { line: 'SMT-1' });
		expect(runs).toHaveLength(14);
		expect(runs.every((r) => r.endedAt && r.stencil === 'ST-PB100')).toBe(true);
		expect(runs.filter((r) => r.deviations.some((d) => d.reason))).toHaveLength(1);
		// Each run logs its first board, numbered through the boards printed before it.
		const oldestFirst = [...runs].reverse();
		oldestFirst.forEach((run, i) => {
			const before = oldestFirst.slice(0, i).reduce((sum, r) => sum + r.boardsPrinted, 0);
			expect(run.boardSerial).toBe(`FW-PB100-${String(before + 1).padStart(7, '0')}`);
		});
		const stencil = listStencilLife(db).find((s) => s.id === runs[0].stencilId)!;
		expect(stencil.printCount).toBe(runs.reduce((sum, r) => sum + r.boardsPrinted, 0));
		const trends = runTrends(db, { line: 'SMT-1', product: 'PB-100' });
		expect(trends.parameters.find((p) => p.key === 'squeegeeSpeedMmS')!.points).toHaveLength(14);
	}, 30_000);

	it('approves each demo stencil for its product and allows the demo pastes the runs use', async () => {
		await seedDemoData(db);
		const fit = Object.fromEntries(listProductFit(db).map((f) => [f.product, f]));
		expect(fit['PB-100']).toMatchObject({
			approvals: [{ stencilName: 'ST-PB100', side: 'top' }],
			alloys: ['SAC305'],
			powderTypes: [4, 5]
		});
		expect(fit['SH-220'].approvals).toEqual([{ stencilName: 'ST-SH220', side: 'top' }]);
		expect(fit['LM-48'].approvals).toEqual([]);
		// The demo runs fit their product: every one on an approved stencil with an allowed paste.
		for (const run of listRuns(db)) {
			const rules = fit[run.product];
			expect(rules.approvals.map((a) => a.stencilName)).toContain(run.stencil);
			const lot = getPasteLot(db, run.pasteLot!)!;
			expect(rules.alloys).toContain(lot.alloy);
			expect(rules.powderTypes).toContain(lot.powderType);
		}
	}, 30_000);
});
