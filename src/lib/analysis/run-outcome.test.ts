import { describe, expect, it } from 'vitest';
import { runOutcome } from './run-outcome';

describe('runOutcome', () => {
	it('pools the boards as if their pads were one sample split in subgroups', () => {
		// Two boards by hand: {90, 100, 110} (mean 100, s² 100) and {80, 90} (mean 85, s² 50).
		// Pad mean (300 + 170)/5 = 94; σ_within = √((2·100 + 1·50)/3) = √(250/3) = 9.1287;
		// Cpk = min(150 − 94, 94 − 50)/(3·9.1287) = 44/27.386 = 1.6067.
		const o = runOutcome({
			boards: 2,
			passBoards: 1,
			pads: 5,
			volumeSum: 3 * 100 + 2 * 85,
			withinSs: 2 * 100 + 1 * 50,
			withinDf: 3
		});
		expect(o.volumeMean).toBeCloseTo(94, 12);
		expect(o.volumeCpk).toBeCloseTo(44 / (3 * Math.sqrt(250 / 3)), 12);
		expect(o.passRate).toBe(0.5);
	});
	it('is null where a figure is undefined', () => {
		const o = runOutcome({
			boards: 0,
			passBoards: 0,
			pads: 0,
			volumeSum: 0,
			withinSs: 0,
			withinDf: 0
		});
		expect(o).toEqual({ volumeMean: null, volumeCpk: null, passRate: null });
	});
});
