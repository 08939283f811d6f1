import { describe, expect, it } from 'vitest';
import { computeOee, demonstratedBestCycle } from './oee';

const MIN = 60_000;

describe('demonstrated best cycle time', () => {
	it('is the 5th percentile (nearest rank) of the last units, newest first', () => {
		// 40 cycle times 20 s … 59 s: nearest rank ⌈0.05 × 40⌉ = 2 → the second smallest, 21 s.
		const newestFirst = Array.from({ length: 40 }, (_, i) => (59 - i) * 1000);
		expect(demonstratedBestCycle(newestFirst, 'P1')).toEqual({
			valueMs: 21_000,
			units: 40,
			how: '5th percentile of the last 40 reported cycle times for P1 = 21.0 s'
		});
	});

	it('looks only at the last N units and ignores missing or non-positive readings', () => {
		// Newest 3: 30, 31, 32 s; the older fast ones (5 s) are beyond N = 3.
		const best = demonstratedBestCycle([30_000, 0, 31_000, 32_000, 5_000, 5_000], 'P1', 5, 4);
		expect(best).toMatchObject({ valueMs: 30_000, units: 3 });
		expect(demonstratedBestCycle([0, NaN, -1], 'P1')).toBeUndefined();
	});

	it('names its method in the performance sentence; a recipe ideal wins over it', () => {
		const boards = Array.from({ length: 10 }, (_, i) => ({
			atMs: i * MIN,
			product: i < 5 ? 'P' : 'Q',
			cycleTimeMs: 30_000,
			firstPassed: true
		}));
		const best = demonstratedBestCycle([24_000, 30_000], 'Q')!;
		const r = computeOee({
			shift: { startMs: 0, endMs: 10 * MIN },
			boards,
			faults: [],
			idealCycleMs: { P: 20_000 },
			demonstratedCycleMs: { P: 1_000, Q: best.valueMs },
			demonstratedHow: { Q: best.how }
		});
		// 5 × 20 s (recipe) + 5 × 24 s (demonstrated) = 220 s over 10 min run.
		expect(r.performance.value).toBeCloseTo(220 / 600, 12);
		expect(r.performance.how).toBe(
			"10 boards × ideal cycle time (from the recipe and the printer's demonstrated best (5th percentile of the last 2 reported cycle times for Q = 24.0 s)) = 3.7 min / 10.0 min run time = 36.7 %"
		);
	});
});
