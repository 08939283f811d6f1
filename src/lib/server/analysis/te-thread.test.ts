import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { TeCurve } from '$lib/analysis';
import { openTestDatabase } from '../testing';
import { seedTeTestData } from './test-data';
import { transferEfficiency, type TeFilters } from './transfer-efficiency';
import * as teThread from './te-thread';

let t: ReturnType<typeof openTestDatabase>;
beforeEach(() => {
	t = openTestDatabase();
});
afterEach(() => t.close());

const TRUTH: TeCurve = { upper: 0.95, lower: 0.4, knee: 0.62, scale: 0.05 };
const ALL: TeFilters = {
	technology: null,
	paste: null,
	powder: null,
	fromMs: null,
	toMs: null,
	floor: 0.7
};
/** Equal up to the order of floating-point sums (the thread sums in one slice). */
const rounded = (v: unknown) =>
	JSON.parse(JSON.stringify(v, (_k, x) => (typeof x === 'number' ? Number(x.toPrecision(9)) : x)));

// Starting the thread under tsx loads the TypeScript sources: seconds on this machine.
describe('transferEfficiencyOffThread', { timeout: 90_000 }, () => {
	it('gives the same answer as the scan in this thread, on the scan thread', async () => {
		await seedTeTestData(t.db, { curve: TRUTH, boards: 40 });
		const here = await transferEfficiency(t.db, ALL);
		const off = await teThread.transferEfficiencyOffThread(t.db, ALL);
		expect(teThread.lastScanThreaded).toBe(true);
		expect(rounded(off)).toEqual(rounded(here));
		expect(off.learnedMinAreaRatio).not.toBeNull();
	});

	it('queues concurrent scans and answers each with its own filters', async () => {
		await seedTeTestData(t.db, { curve: TRUTH, boards: 12 });
		const later = { ...ALL, fromMs: Date.UTC(2026, 2, 1, 6, 6) };
		const [a, b] = await Promise.all([
			teThread.transferEfficiencyOffThread(t.db, ALL),
			teThread.transferEfficiencyOffThread(t.db, later)
		]);
		expect(rounded(a)).toEqual(rounded(await transferEfficiency(t.db, ALL)));
		expect(rounded(b)).toEqual(rounded(await transferEfficiency(t.db, later)));
		expect(b.boardsMatched).toBeLessThan(a.boardsMatched);
	});

	it('sees rows committed after the thread opened its connection', async () => {
		const empty = await teThread.transferEfficiencyOffThread(t.db, ALL);
		expect(empty.boardsMatched).toBe(0);
		await seedTeTestData(t.db, { curve: TRUTH, boards: 8 });
		const after = await teThread.transferEfficiencyOffThread(t.db, ALL);
		expect(after.boardsMatched).toBe(8);
	});
});
