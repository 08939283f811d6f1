import { describe, expect, it } from 'vitest';
import { spreadLabels } from './spread-labels';

describe('spreadLabels', () => {
	it('leaves labels that are far enough apart where they are', () => {
		expect(spreadLabels([20, 80, 140], 11, 0, 200)).toEqual([20, 80, 140]);
	});

	it('spreads coinciding labels evenly about their position, in input order', () => {
		// UCL, CL and LCL of a constant parameter: all at 50.
		expect(spreadLabels([50, 50, 50], 11, 0, 200)).toEqual([39, 50, 61]);
	});

	it('moves a close pair apart symmetrically and keeps every gap at least the minimum', () => {
		expect(spreadLabels([100, 104], 10, 0, 200)).toEqual([97, 107]);
		const ys = spreadLabels([30, 33, 36, 120, 125], 11, 0, 200);
		const sorted = [...ys].sort((a, b) => a - b);
		for (let i = 1; i < sorted.length; i++)
			expect(sorted[i] - sorted[i - 1]).toBeGreaterThanOrEqual(11 - 1e-9);
		// The first cluster's mean (33) stays its centre.
		expect((ys[0] + ys[1] + ys[2]) / 3).toBeCloseTo(33, 9);
	});

	it('stays inside the chart when a cluster sits at an edge', () => {
		expect(spreadLabels([2, 2, 2], 10, 0, 100)).toEqual([0, 10, 20]);
		expect(spreadLabels([99, 99], 10, 0, 100)).toEqual([90, 100]);
	});

	it('merges clusters that a spread pushes into each other', () => {
		// 40,40 spread to 35,45; 50 would then sit 5 from 45: all three become one cluster.
		expect(spreadLabels([40, 40, 50], 10, 0, 200)).toEqual([
			43.333333333333336 - 10,
			43.333333333333336,
			43.333333333333336 + 10
		]);
	});
});
