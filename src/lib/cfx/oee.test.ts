import { describe, expect, it } from 'vitest';
import { changeovers, computeOee, nearestRank, unionWithin } from './oee';

// The hand-computed example of reference/cfx/oee-example.md.
const MIN = 60_000;
const boards = [
	...Array.from({ length: 120 }, (_, i) => ({ atMs: i * MIN, product: 'P' })),
	...Array.from({ length: 100 }, (_, i) => ({ atMs: (200 + i) * MIN, product: 'Q' })),
	...Array.from({ length: 170 }, (_, i) => ({ atMs: (310 + i) * MIN, product: 'Q' }))
].map((b, i) => ({
	...b,
	cycleTimeMs: 48_000,
	firstPassed: i % 32 !== 5 || i >= 32 * 12 ? true : false
}));

describe('computeOee', () => {
	it('reproduces the hand-computed shift (reference/cfx/oee-example.md)', () => {
		expect(boards.filter((b) => !b.firstPassed)).toHaveLength(12);
		const r = computeOee({
			shift: { startMs: 0, endMs: 480 * MIN },
			boards,
			faults: [
				{ faultId: 'a', occurredAtMs: 130 * MIN, clearedAtMs: 150 * MIN },
				{ faultId: 'b', occurredAtMs: 300 * MIN, clearedAtMs: 310 * MIN }
			],
			idealCycleMs: { P: 50_000, Q: 50_000 },
			demonstratedCycleMs: {}
		});
		expect(r).toMatchObject({
			plannedMs: 480 * MIN,
			unavailableMs: 86 * MIN,
			faultMs: 30 * MIN,
			idleMs: 56 * MIN,
			runMs: 394 * MIN,
			boards: 390,
			inspected: 390,
			firstPassed: 378
		});
		expect(r.availability.value).toBeCloseTo(394 / 480, 12);
		expect(r.performance.value).toBeCloseTo(325 / 394, 12);
		expect(r.quality.value).toBeCloseTo(378 / 390, 12);
		expect(r.oee.value).toBeCloseTo(0.65625, 12);
		expect(r.availability.how).toBe(
			'(480.0 min planned − 30.0 min in faults − 56.0 min idle beyond 5.0 min without a board) / 480.0 min = 82.1 %'
		);
		expect(r.performance.how).toBe(
			'390 boards × ideal cycle time (from the recipe) = 325.0 min / 394.0 min run time = 82.5 %'
		);
		expect(r.quality.how).toBe(
			'378 of 390 inspected boards passed SPI at their first inspection = 96.9 %'
		);
		expect(r.oee.how).toBe(
			'availability × performance × quality = 82.1 % × 82.5 % × 96.9 % = 65.6 %'
		);
	});

	it('an uncleared fault runs to the shift end; unknown factors say why', () => {
		const r = computeOee({
			shift: { startMs: 0, endMs: 60 * MIN },
			boards: [{ atMs: 0, product: 'P', cycleTimeMs: null, firstPassed: null }],
			faults: [{ faultId: 'x', occurredAtMs: 10 * MIN, clearedAtMs: null }],
			idealCycleMs: {},
			demonstratedCycleMs: {}
		});
		// Idle from 5 min (after the only board) to 60; the fault 10–60 lies inside it.
		expect(r).toMatchObject({ faultMs: 50 * MIN, unavailableMs: 55 * MIN, runMs: 5 * MIN });
		expect(r.performance).toEqual({ value: null, how: 'no board with a known ideal cycle time' });
		expect(r.quality).toEqual({ value: null, how: 'no board of the shift was inspected' });
		expect(r.oee.value).toBeNull();
	});

	it('falls back to the demonstrated best cycle time and says so', () => {
		const cycles = [20_000, 21_000, 22_000, 23_000, 24_000, 25_000, 26_000, 27_000, 28_000, 29_000];
		expect(nearestRank(cycles, 10)).toBe(20_000);
		expect(nearestRank(cycles, 50)).toBe(24_000);
		const r = computeOee({
			shift: { startMs: 0, endMs: 10 * MIN },
			boards: cycles.map((c, i) => ({
				atMs: i * MIN,
				product: 'P',
				cycleTimeMs: c,
				firstPassed: true
			})),
			faults: [],
			idealCycleMs: {},
			demonstratedCycleMs: { P: 20_000 }
		});
		expect(r.performance.value).toBeCloseTo((10 * 20_000) / (10 * MIN), 12);
		expect(r.performance.how).toContain("the printer's demonstrated best");
	});
});

describe('unionWithin and changeovers', () => {
	it('merges overlapping intervals and clips them', () => {
		expect(
			unionWithin(
				[
					{ startMs: 5, endMs: 15 },
					{ startMs: -10, endMs: 2 },
					{ startMs: 12, endMs: 20 },
					{ startMs: 30, endMs: 40 }
				],
				{ startMs: 0, endMs: 35 }
			)
		).toEqual([
			{ startMs: 0, endMs: 2 },
			{ startMs: 5, endMs: 20 },
			{ startMs: 30, endMs: 35 }
		]);
	});

	it('measures stencil and product changes from the boards around them (reference/cfx/oee-example.md)', () => {
		expect(changeovers(boards, [{ atMs: 160 * MIN, from: 'ST-A', to: 'ST-B' }])).toEqual([
			{
				kind: 'stencil',
				atMs: 160 * MIN,
				from: 'ST-A',
				to: 'ST-B',
				lastBoardBeforeMs: 119 * MIN,
				firstBoardAfterMs: 200 * MIN,
				durationMs: 81 * MIN
			},
			{
				kind: 'product',
				atMs: 200 * MIN,
				from: 'P',
				to: 'Q',
				lastBoardBeforeMs: 119 * MIN,
				firstBoardAfterMs: 200 * MIN,
				durationMs: 81 * MIN
			}
		]);
		expect(
			changeovers([{ atMs: 0, product: 'P' }], [{ atMs: 10, from: null, to: 'ST-C' }])[0].durationMs
		).toBeNull();
	});
});
