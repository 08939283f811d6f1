import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { areaRatioBin, predictTe, type TeCurve } from '$lib/analysis';
import { openTestDatabase } from '../testing';
import { seedTeTestData } from './test-data';
import { transferEfficiency, type TeFilters } from './transfer-efficiency';

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

describe('transferEfficiency (SQL aggregation over pads)', () => {
	it('bins TE = volume_um3 ÷ aperture volume by area ratio and learns the limit', async () => {
		const { expected } = await seedTeTestData(t.db, { curve: TRUTH, boards: 40 });
		const r = await transferEfficiency(t.db, ALL);
		expect(r.boardsMatched).toBe(40);
		expect(r.boardsUsed).toBe(40);
		expect(r.padsWithoutVolume).toBe(0);
		expect(r.n + r.trimmed).toBe(expected.length);
		// Each bin's mean is the mean of the exact per-pad TE of its kept pads: in this seeded data
		// the top bin trims nothing, so it equals the plain mean computed here from the file.
		const top = r.bins[r.bins.length - 1];
		const topBin = areaRatioBin(top.areaRatio);
		const inTop = expected.filter((e) => areaRatioBin(e.ar) === topBin);
		expect(top.trimmed).toBe(0);
		expect(top.n).toBe(inTop.length);
		expect(top.teMean).toBeCloseTo(inTop.reduce((s, e) => s + e.te, 0) / inTop.length, 10);
		expect(r.fit).not.toBeNull();
		const c = r.fit!.coefficients;
		expect(Math.abs(c.knee - TRUTH.knee)).toBeLessThan(0.03);
		expect(Math.abs(c.upper - TRUTH.upper)).toBeLessThan(0.03);
		const trueLimit =
			TRUTH.knee - TRUTH.scale * Math.log((TRUTH.upper - TRUTH.lower) / (0.7 - TRUTH.lower) - 1);
		expect(Math.abs(r.learnedMinAreaRatio! - trueLimit)).toBeLessThan(0.03);
		expect(r.reason).toBeNull();
		expect(predictTe(c, 1.5)).toBeGreaterThan(0.9);
	}, 60_000);

	it('filters by technology and dates, and says why there is no limit', async () => {
		await seedTeTestData(t.db, { curve: TRUTH, boards: 10 });
		const none = await transferEfficiency(t.db, { ...ALL, technology: 'laser-stainless' });
		expect(none.n).toBe(0);
		expect(none.boardsMatched).toBe(0);
		expect(none.learnedMinAreaRatio).toBeNull();
		expect(none.reason).toMatch(/too few area-ratio bins/);
		const later = await transferEfficiency(t.db, { ...ALL, fromMs: Date.UTC(2026, 2, 1, 6, 5) });
		expect(later.boardsMatched).toBe(5);
		const paste = await transferEfficiency(t.db, { ...ALL, paste: 'SAC305' });
		expect(paste.boardsMatched).toBe(0); // the test boards have no print run, so no paste lot
	}, 60_000);

	it('drops its temporary tables, and concurrent requests do not share them', async () => {
		await seedTeTestData(t.db, { curve: TRUTH, boards: 12 });
		const alone = await transferEfficiency(t.db, ALL);
		const later = { ...ALL, fromMs: Date.UTC(2026, 2, 1, 6, 6) };
		const aloneLater = await transferEfficiency(t.db, later);
		// Slices of one board each, so the two scans interleave.
		const one = { padsPerSlice: 1 };
		const [a, b] = await Promise.all([
			transferEfficiency(t.db, ALL, one),
			transferEfficiency(t.db, later, one)
		]);
		// Same answers up to the order of floating-point sums (slices are summed separately).
		const rounded = (v: unknown) =>
			JSON.parse(
				JSON.stringify(v, (_k, x) => (typeof x === 'number' ? Number(x.toPrecision(9)) : x))
			);
		expect(rounded(a)).toEqual(rounded(alone));
		expect(rounded(b)).toEqual(rounded(aloneLater));
		expect(
			t.db.$client
				.prepare(`select count(*) from sqlite_temp_master where name like 'analysis_te_%'`)
				.pluck()
				.get()
		).toBe(0);
	}, 60_000);
});
