import { describe, it, expect } from 'vitest';
import { assignRefdesFromCentroids } from './assign-refdes';
import { StencilBudgetError } from './limits';
import { circle, rect } from './test-fixtures';

// A 0603-like part R1 at (0, 0) with pads at x = ±800 µm, and a QFP U1 at (10000, 0).
const flashes = [
	rect(900, 950, { refdes: '', pad: '', xUm: 800, yUm: 0 }),
	rect(900, 950, { refdes: '', pad: '', xUm: -800, yUm: 0 }),
	rect(1000, 200, { refdes: '', pad: '', xUm: 10000, yUm: 400 }),
	rect(1000, 200, { refdes: '', pad: '', xUm: 10000, yUm: -400 }),
	rect(1000, 200, { refdes: '', pad: '', xUm: 50000, yUm: 0 })
];
const centroids = [
	{ refdes: 'R1', xUm: 0, yUm: 0 },
	{ refdes: 'U1', xUm: 10000, yUm: 0 }
];

describe('assignRefdesFromCentroids', () => {
	const r = assignRefdesFromCentroids(flashes, centroids, 2000);
	it('nearest centroid within the radius; pads numbered top-to-bottom then left-to-right', () => {
		expect(r.apertures.map((a) => `${a.refdes}.${a.pad}`)).toEqual([
			'R1.2',
			'R1.1',
			'U1.1',
			'U1.2',
			'.'
		]);
	});
	it('reports apertures with no centroid in range', () => expect(r.unassigned).toEqual([4]));
	it('numbering does not depend on input order', () => {
		const rev = assignRefdesFromCentroids([...flashes].reverse(), centroids, 2000);
		expect(rev.apertures.map((a) => `${a.xUm},${a.yUm}=${a.refdes}.${a.pad}`).sort()).toEqual(
			r.apertures.map((a) => `${a.xUm},${a.yUm}=${a.refdes}.${a.pad}`).sort()
		);
	});
	it('a distance exactly equal to the radius is inside', () => {
		expect(
			assignRefdesFromCentroids([rect(1, 1, { xUm: 2000 })], centroids, 2000).apertures[0].refdes
		).toBe('R1');
	});
	it('does not mutate its input', () => {
		expect(flashes[0].refdes).toBe('');
	});
	it('empty inputs', () => {
		expect(assignRefdesFromCentroids([], centroids, 100)).toEqual({
			apertures: [],
			unassigned: []
		});
		expect(assignRefdesFromCentroids(flashes.slice(0, 1), [], 100).unassigned).toEqual([0]);
	});
	it('rejects a bad radius', () => {
		expect(() => assignRefdesFromCentroids(flashes, centroids, 0)).toThrow(
			/maxDistanceUm: must be a finite number greater than 0/
		);
	});
});

describe('assignRefdesFromCentroids: piled components are refused by their count', () => {
	it('5,000 apertures and 5,000 centroids on one spot need 25,000,000 tests: refused before any', () => {
		const apertures = Array.from({ length: 5_000 }, () => circle(300, { refdes: '', pad: '' }));
		const centroids = Array.from({ length: 5_000 }, (_, i) => ({
			refdes: `U${i}`,
			xUm: 0,
			yUm: 0
		}));
		expect(() => assignRefdesFromCentroids(apertures, centroids, 10_000)).toThrow(
			new StencilBudgetError(
				'naming the apertures from the centroid file needs 25,000,000 distance tests ' +
					'(components piled within 10000 µm of each other); the limit is 20,000,000',
				413
			)
		);
		// Spread out, the same counts are cheap and assigned.
		const spread = centroids.map((c, i) => ({ ...c, xUm: i * 30_000 }));
		const placed = apertures.map((a, i) => ({ ...a, xUm: i * 30_000 }));
		expect(assignRefdesFromCentroids(placed, spread, 10_000).unassigned).toEqual([]);
	});
});
