import { describe, it, expect } from 'vitest';
import {
	apertureAt,
	buildHitIndex,
	distanceToAperture,
	pointInAperture,
	pointInPolygon
} from './hit-index';
import type { ApertureInput, PointUm } from './aperture';
import { apertureBoundsUm } from './outline';
import { circle, polygon, rect } from './test-fixtures';

// Every expected value below follows from plane geometry (first principles), worked in the comments.

describe('pointInAperture: rectangles', () => {
	const pad = rect(1000, 200); // |x| ≤ 500, |y| ≤ 100
	it.each([
		[[499, 99], true],
		[[500, 100], true], // the corner itself is on the edge
		[[501, 0], false],
		[[0, 101], false],
		[[-499, -99], true]
	] as [PointUm, boolean][])('1000 × 200 at the origin, point %j → %s', (p, inside) =>
		expect(pointInAperture(pad, p)).toBe(inside)
	);

	it('rotated 90° about (5000, 0): the long side now runs along y', () => {
		const turned = rect(1000, 200, { xUm: 5000, rotationDeg: 90 });
		expect(pointInAperture(turned, [5099, 499])).toBe(true);
		expect(pointInAperture(turned, [5101, 0])).toBe(false);
		expect(pointInAperture(turned, [5499, 0])).toBe(false); // inside only if it were not turned
	});

	it('rotated 30°: a point 450 µm along the turned axis is in, the same distance along x is not', () => {
		const turned = rect(1000, 200, { rotationDeg: 30 });
		const c = Math.cos(Math.PI / 6);
		const s = Math.sin(Math.PI / 6);
		expect(pointInAperture(turned, [450 * c, 450 * s])).toBe(true);
		// (450, 0) in the pad's frame is (450 cos 30°, −450 sin 30°) = (389.7, −225): |y| > 100.
		expect(pointInAperture(turned, [450, 0])).toBe(false);
		// 90 µm across the turned axis is inside, 110 µm is not.
		expect(pointInAperture(turned, [-90 * s, 90 * c])).toBe(true);
		expect(pointInAperture(turned, [-110 * s, 110 * c])).toBe(false);
	});

	it('rounded corners: the corner square outside the quarter circle is not in the opening', () => {
		const obround = rect(1000, 200, { cornerRadiusUm: 100 }); // arc centres at (±400, 0)
		// (499, 99): 99² + 99² = 19602 > 100² → outside; (450, 50): 50² + 50² = 5000 ≤ 100² → inside.
		expect(pointInAperture(obround, [499, 99])).toBe(false);
		expect(pointInAperture(obround, [450, 50])).toBe(true);
		expect(pointInAperture(obround, [500, 0])).toBe(true);
		expect(pointInAperture(obround, [0, 99])).toBe(true);
		const rounded = rect(1000, 300, { cornerRadiusUm: 50, shape: 'rounded-rectangle' }); // centres (±450, ±100)
		expect(pointInAperture(rounded, [480, 130])).toBe(true); // 30² + 30² = 1800 ≤ 2500
		expect(pointInAperture(rounded, [490, 140])).toBe(false); // 40² + 40² = 3200 > 2500
	});
});

describe('pointInAperture: circles', () => {
	const disc = circle(500, { xUm: 1000 }); // r = 250
	it('inside when x² + y² ≤ r² from the centre', () => {
		expect(pointInAperture(disc, [1176, 176])).toBe(true); // 2·176² = 61952 ≤ 62500
		expect(pointInAperture(disc, [1177, 177])).toBe(false); // 2·177² = 62658 > 62500
		expect(pointInAperture(disc, [1150, 200])).toBe(true); // 3-4-5: exactly on the circle
	});
	it('rotation does not move a circle', () =>
		expect(pointInAperture({ ...disc, rotationDeg: 37 }, [1249, 0])).toBe(true));
});

describe('pointInAperture: polygons', () => {
	const homePlate: PointUm[] = [
		[-200, -150],
		[200, -150],
		[250, 0],
		[200, 150],
		[-200, 150]
	];
	it('home plate: the slanted edge from (250, 0) to (200, 150) passes x = 216.7 at y = 100', () => {
		const a = polygon(homePlate);
		expect(pointInAperture(a, [240, 0])).toBe(true);
		expect(pointInAperture(a, [210, 100])).toBe(true);
		expect(pointInAperture(a, [220, 100])).toBe(false);
		expect(pointInAperture(a, [-200, 0])).toBe(true); // on an edge
	});
	it('a concave L shape: the notch is outside, either vertex order', () => {
		const l: PointUm[] = [
			[0, 0],
			[200, 0],
			[200, 100],
			[100, 100],
			[100, 200],
			[0, 200]
		];
		for (const v of [l, [...l].reverse()]) {
			expect(pointInPolygon([150, 150], v)).toBe(false);
			expect(pointInPolygon([50, 150], v)).toBe(true);
			expect(pointInPolygon([150, 50], v)).toBe(true);
		}
	});
	it('placed and turned: vertices are relative to (x, y) and rotate about it', () => {
		// Square 0..100 turned 90° about (1000, 1000) covers x 900..1000, y 1000..1100.
		const a = polygon(
			[
				[0, 0],
				[100, 0],
				[100, 100],
				[0, 100]
			],
			{ xUm: 1000, yUm: 1000, rotationDeg: 90 }
		);
		expect(pointInAperture(a, [950, 1050])).toBe(true);
		expect(pointInAperture(a, [1050, 1050])).toBe(false);
	});
	it('a closing vertex that repeats the first is ignored', () =>
		expect(
			pointInAperture(
				polygon([
					[0, 0],
					[100, 0],
					[0, 100],
					[0, 0]
				]),
				[20, 20]
			)
		).toBe(true));
});

describe('distanceToAperture', () => {
	it('rectangle: to the nearest side, or corner', () => {
		expect(distanceToAperture(rect(1000, 200), [600, 0])).toBe(100);
		expect(distanceToAperture(rect(1000, 200), [600, 200])).toBeCloseTo(Math.SQRT2 * 100, 12);
		expect(distanceToAperture(rect(1000, 200), [0, 0])).toBe(0);
	});
	it('obround: past the end, the distance is to the arc', () =>
		expect(distanceToAperture(rect(1000, 200, { cornerRadiusUm: 100 }), [600, 0])).toBeCloseTo(
			100,
			12
		));
	it('circle: distance to the centre minus the radius', () =>
		expect(distanceToAperture(circle(500), [300, 400])).toBeCloseTo(250, 12));
	it('polygon: the nearest edge', () =>
		expect(
			distanceToAperture(
				polygon([
					[0, 0],
					[100, 0],
					[100, 100],
					[0, 100]
				]),
				[150, 50]
			)
		).toBeCloseTo(50, 12));
});

/** A dense grid of mixed apertures, like a real paste layer (pitch 900 µm). */
function mixedStencil(count: number): ApertureInput[] {
	const out: ApertureInput[] = [];
	for (let i = 0; i < count; i++) {
		const at = { xUm: (i % 40) * 900, yUm: Math.floor(i / 40) * 900, rotationDeg: (i * 17) % 180 };
		const kind = i % 4;
		if (kind === 0) out.push(rect(700, 250, at));
		else if (kind === 1) out.push(circle(400, at));
		else if (kind === 2) out.push(rect(800, 300, { ...at, cornerRadiusUm: 100 }));
		else
			out.push(
				polygon(
					[
						[-200, -150],
						[200, -150],
						[250, 0],
						[200, 150],
						[-200, 150]
					],
					at
				)
			);
	}
	return out;
}

/** The answer without an index: every aperture tested, the smallest containing one wins. */
function bruteForce(apertures: ApertureInput[], p: PointUm): number | null {
	let best: number | null = null;
	let bestArea = Infinity;
	apertures.forEach((a, i) => {
		if (!pointInAperture(a, p)) return;
		const b = apertureBoundsUm(a);
		const area = (b.xMaxUm - b.xMinUm) * (b.yMaxUm - b.yMinUm);
		if (area < bestArea) {
			best = i;
			bestArea = area;
		}
	});
	return best;
}

describe('apertureAt with the grid index', () => {
	const apertures = mixedStencil(800);
	const index = buildHitIndex(apertures);

	it('agrees with testing every aperture, at 2,000 scattered points', () => {
		let hits = 0;
		for (let k = 0; k < 2000; k++) {
			// A deterministic scatter (golden-ratio sequence) over the stencil and a margin around it.
			const p: PointUm = [((k * 0.618034) % 1) * 37000 - 500, ((k * 0.754878) % 1) * 19000 - 500];
			const expected = bruteForce(apertures, p);
			expect(apertureAt(index, p)).toBe(expected);
			if (expected !== null) hits++;
		}
		expect(hits).toBeGreaterThan(100); // the scatter does land on openings
	});

	it('every aperture is found at its own centre', () => {
		apertures.forEach((a, i) => expect(apertureAt(index, [a.xUm, a.yUm])).toBe(i));
	});

	it('a small opening inside a larger one wins', () => {
		const nested = [rect(3000, 3000), circle(200, { xUm: 500 })];
		expect(apertureAt(buildHitIndex(nested), [500, 0])).toBe(1);
		expect(apertureAt(buildHitIndex(nested), [-500, 0])).toBe(0);
	});

	it('tolerance: a point 30 µm beyond an edge is missed exactly, found within 50 µm', () => {
		const one = buildHitIndex([rect(1000, 200), rect(1000, 200, { xUm: 5000 })]);
		expect(apertureAt(one, [530, 0])).toBeNull();
		expect(apertureAt(one, [530, 0], 50)).toBe(0);
		expect(apertureAt(one, [530, 0], 20)).toBeNull();
		// In the bounding-box corner of a circle but 250·(√2 − 1) ≈ 103.6 µm from the circle itself.
		const disc = buildHitIndex([circle(500)]);
		expect(apertureAt(disc, [249, 249], 50)).toBeNull();
		expect(apertureAt(disc, [249, 249], 110)).toBe(0);
	});

	it('invalid apertures are left out; an empty list finds nothing', () => {
		const index2 = buildHitIndex([rect(Number.NaN, 200), rect(1000, 200, { xUm: 3000 })]);
		expect(index2.boxes[0]).toBeNull();
		expect(apertureAt(index2, [3000, 0])).toBe(1);
		expect(apertureAt(index2, [0, 0], 1000)).toBeNull();
		expect(apertureAt(buildHitIndex([]), [0, 0], 1000)).toBeNull();
	});

	it('a single aperture and points far outside the grid', () => {
		const single = buildHitIndex([circle(300)]);
		expect(apertureAt(single, [0, 0])).toBe(0);
		expect(apertureAt(single, [1e9, -1e9], 10)).toBeNull();
	});
});
