import { describe, it, expect } from 'vitest';
import { mapLayers, type MapAperture } from './map-layers';
import { apertureSvgPath } from './outline';
import { circle, polygon, rect } from './test-fixtures';

const fail = (a: ReturnType<typeof rect>): MapAperture => ({ ...a, status: 'fail' });
const pass = (a: ReturnType<typeof rect>): MapAperture => ({ ...a, status: 'pass' });

/** Signed area of a straight-edged SVG path "Mx yLx y…Z" (shoelace; positive = counter-clockwise). */
function signedArea(d: string): number {
	const pts = d
		.replace(/^M|Z$/g, '')
		.split('L')
		.map((p) => p.split(' ').map(Number));
	let twice = 0;
	pts.forEach(([x1, y1], i) => {
		const [x2, y2] = pts[(i + 1) % pts.length];
		twice += x1 * y2 - x2 * y1;
	});
	return twice / 2;
}

describe('mapLayers', () => {
	const apertures = [
		pass(rect(2000, 1000)),
		fail(circle(500, { xUm: 5000 })),
		fail(rect(1000, 200, { yUm: -3000, rotationDeg: 90 })),
		pass(
			polygon(
				[
					[0, 0],
					[100, 0],
					[0, 100]
				],
				{ xUm: -4000 }
			)
		)
	];
	const layers = mapLayers(apertures);

	it('one path per status, one subpath per aperture, in list order', () => {
		expect(layers.passCount).toBe(2);
		expect(layers.failCount).toBe(2);
		expect(layers.passPath).toBe(apertureSvgPath(apertures[0]) + apertureSvgPath(apertures[3]));
		expect(layers.failPath).toBe(apertureSvgPath(apertures[1]) + apertureSvgPath(apertures[2]));
		expect(layers.failPath.match(/M/g)).toHaveLength(2);
		expect(layers.skipped).toEqual([]);
	});

	it('bounds are the union of the exact outlines', () => {
		// x: polygon from −4000; circle to 5000 + 250. y: turned pad down to −3000 − 500; rectangle up to 500.
		expect(layers.boundsUm).toEqual({ xMinUm: -4000, yMinUm: -3500, xMaxUm: 5250, yMaxUm: 500 });
	});

	it('an invalid aperture is skipped, not drawn, and does not stop the rest', () => {
		const withBad = mapLayers([
			pass(rect(1000, 200)),
			fail(rect(300, 200, { cornerRadiusUm: 150 }))
		]);
		expect(withBad.skipped).toEqual([1]);
		expect(withBad.failPath).toBe('');
		expect(withBad.passCount).toBe(1);
	});

	it('nothing to draw: empty paths and no bounds', () => {
		expect(mapLayers([])).toEqual({
			passPath: '',
			failPath: '',
			passCount: 0,
			failCount: 0,
			skipped: [],
			boundsUm: null
		});
	});

	it('polygons listed clockwise are drawn counter-clockwise, like rectangles, so overlaps stay filled', () => {
		const clockwise = polygon([
			[0, 0],
			[0, 100],
			[100, 100],
			[100, 0]
		]);
		expect(signedArea(apertureSvgPath(clockwise))).toBe(10000);
		expect(signedArea(apertureSvgPath(rect(200, 100, { rotationDeg: 33 })))).toBeCloseTo(20000, 0); // coordinates are written to 0.001 µm;
	});
});
