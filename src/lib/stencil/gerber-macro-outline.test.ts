import { describe, it, expect } from 'vitest';
import { macroShapeOutline, rectangleFromCorners } from './gerber-macro-outline';
import type { GerberPadPrimitive, GerberPoint } from './gerber-types';

/** Corners of an L × W rectangle centred at (cx, cy), turned by deg, first side along the turn. */
function corners(l: number, w: number, deg: number, cx = 0, cy = 0): GerberPoint[] {
	const a = (deg * Math.PI) / 180;
	return [
		[-l / 2, -w / 2],
		[l / 2, -w / 2],
		[l / 2, w / 2],
		[-l / 2, w / 2]
	].map(([u, v]) => [
		cx + u * Math.cos(a) - v * Math.sin(a),
		cy + u * Math.sin(a) + v * Math.cos(a)
	]);
}

function shoelace(points: readonly GerberPoint[]): number {
	let twice = 0;
	for (let i = 0; i < points.length; i++) {
		const [x1, y1] = points[i];
		const [x2, y2] = points[(i + 1) % points.length];
		twice += x1 * y2 - x2 * y1;
	}
	return Math.abs(twice / 2);
}

describe('rectangleFromCorners', () => {
	const cases: [string, GerberPoint[], object | null][] = [
		[
			'axis-aligned',
			corners(2, 1, 0, 1, 0.5),
			{ cx: 1, cy: 0.5, length: 2, width: 1, rotationDeg: 0 }
		],
		[
			'turned 30°',
			corners(1.2, 0.5, 30),
			{ cx: 0, cy: 0, length: 1.2, width: 0.5, rotationDeg: 30 }
		],
		[
			'turned 120° is the same as −60°',
			corners(1.2, 0.5, 120),
			{ cx: 0, cy: 0, length: 1.2, width: 0.5, rotationDeg: -60 }
		],
		[
			'turned 90° stays 90°',
			corners(1, 0.4, 90),
			{ cx: 0, cy: 0, length: 1, width: 0.4, rotationDeg: 90 }
		],
		[
			'turned −90° becomes 90°',
			corners(1, 0.4, -90),
			{ cx: 0, cy: 0, length: 1, width: 0.4, rotationDeg: 90 }
		],
		[
			'a parallelogram is not a rectangle',
			[
				[0, 0],
				[2, 0],
				[3, 1],
				[1, 1]
			],
			null
		],
		[
			'a trapezoid is not a rectangle',
			[
				[0, 0],
				[3, 0],
				[2, 1],
				[1, 1]
			],
			null
		],
		[
			'three points',
			[
				[0, 0],
				[1, 0],
				[0, 1]
			],
			null
		],
		[
			'a degenerate side',
			[
				[0, 0],
				[0, 0],
				[0, 1],
				[0, 1]
			],
			null
		]
	];
	for (const [name, pts, want] of cases) {
		it(name, () => {
			const got = rectangleFromCorners(pts);
			if (want === null) expect(got).toBeNull();
			else {
				expect(got).not.toBeNull();
				for (const [k, v] of Object.entries(want))
					expect(got?.[k as keyof typeof got]).toBeCloseTo(v as number, 9);
			}
		});
	}
});

describe('macroShapeOutline', () => {
	const tol = 0.0005; // 0.5 µm in mm

	it('maps one circle to a circle at its offset', () => {
		expect(macroShapeOutline([{ type: 'circle', r: 0.25, cx: 0.1, cy: -0.2 }], tol)).toEqual({
			outline: { kind: 'circle', diameter: 0.5, cx: 0.1, cy: -0.2 }
		});
	});

	it('maps one unrotated rect to a rectangle, keeping a corner radius', () => {
		expect(
			macroShapeOutline([{ type: 'rect', width: 1, height: 0.4, r: 0.1, cx: 0, cy: 0 }], tol)
		).toEqual({
			outline: {
				kind: 'rectangle',
				length: 1,
				width: 0.4,
				cornerRadius: 0.1,
				cx: 0,
				cy: 0,
				rotationDeg: 0
			}
		});
	});

	it('maps a four-corner rectangle polygon to a rotated rectangle', () => {
		const result = macroShapeOutline(
			[{ type: 'poly', points: corners(1.2, 0.5, 30, 0.3, 0) }],
			tol
		);
		expect(result).toMatchObject({ outline: { kind: 'rectangle', rotationDeg: 30 } });
	});

	it('keeps other polygons as polygons relative to the flash point', () => {
		const tri: GerberPoint[] = [
			[0, 0],
			[1, 0],
			[0, 1]
		];
		expect(macroShapeOutline([{ type: 'poly', points: tri }], tol)).toEqual({
			outline: { kind: 'polygon', vertices: tri, cx: 0, cy: 0, rotationDeg: 0 }
		});
	});

	it('joins a rectangle and two end circles into a stadium (convex), area within the chord bound', () => {
		// Stadium: 1 × 0.5 body plus two half discs of r = 0.25: area 0.5 + π·0.25² (first principles).
		const prims: GerberPadPrimitive[] = [
			{ type: 'rect', width: 1, height: 0.5, r: 0, cx: 0, cy: 0 },
			{ type: 'circle', r: 0.25, cx: -0.5, cy: 0 },
			{ type: 'circle', r: 0.25, cx: 0.5, cy: 0 }
		];
		const result = macroShapeOutline(prims, tol);
		if (!('outline' in result) || result.outline.kind !== 'polygon')
			throw new Error('expected a polygon');
		const exact = 0.5 + Math.PI * 0.25 ** 2;
		const area = shoelace(result.outline.vertices);
		expect(area).toBeLessThanOrEqual(exact);
		expect(area).toBeGreaterThanOrEqual(exact - tol * 2 * Math.PI * 0.25);
	});

	/** The usual CAD rounded-rectangle macro: body outline, corner circles, side strips. */
	function roundRectMacro(hl: number, hw: number, r: number, deg: number): GerberPadPrimitive[] {
		const body = corners(2 * hl, 2 * hw, deg);
		const strips: GerberPadPrimitive[] = body.map((p, i) => {
			const q = body[(i + 1) % 4];
			// A vector line of width 2r from corner p to corner q: its four corners.
			const [dx, dy] = [q[0] - p[0], q[1] - p[1]];
			const len = Math.hypot(dx, dy);
			const [nx, ny] = [(-dy / len) * r, (dx / len) * r];
			return {
				type: 'poly',
				points: [
					[p[0] - nx, p[1] - ny],
					[q[0] - nx, q[1] - ny],
					[q[0] + nx, q[1] + ny],
					[p[0] + nx, p[1] + ny]
				]
			};
		});
		return [
			{ type: 'poly', points: body },
			...body.map(([cx, cy]): GerberPadPrimitive => ({ type: 'circle', r, cx, cy })),
			...strips
		];
	}

	it('recognises a rounded-rectangle macro turned 30° as an exact rounded rectangle', () => {
		// Body 0.8 × 0.4 with r = 0.1 on every side: 1.0 × 0.6, r 0.1 (first principles).
		const result = macroShapeOutline(roundRectMacro(0.4, 0.2, 0.1, 30), tol);
		if (!('outline' in result) || result.outline.kind !== 'rectangle')
			throw new Error('expected a rectangle');
		expect(result.outline.length).toBeCloseTo(1, 9);
		expect(result.outline.width).toBeCloseTo(0.6, 9);
		expect(result.outline.cornerRadius).toBeCloseTo(0.1, 9);
		expect(result.outline.rotationDeg).toBeCloseTo(30, 6);
		expect(result.outline.cx).toBeCloseTo(0, 9);
	});

	it('gives a plain rectangle for a rounded-rectangle macro with radius 0', () => {
		const result = macroShapeOutline(roundRectMacro(0.4, 0.2, 0, 0), tol);
		expect(result).toMatchObject({ outline: { kind: 'rectangle', cornerRadius: 0 } });
		if ('outline' in result && result.outline.kind === 'rectangle') {
			expect(result.outline.length).toBeCloseTo(0.8, 9);
			expect(result.outline.width).toBeCloseTo(0.4, 9);
		}
	});

	it('skips corner circles on a body without side strips (notched, not convex)', () => {
		const prims = roundRectMacro(0.4, 0.2, 0.1, 0).slice(0, 5);
		expect(macroShapeOutline(prims, tol)).toMatchObject({
			skipReason: expect.stringMatching(/non-convex/)
		});
	});

	it('treats a circle inside a larger circle as the larger circle', () => {
		const result = macroShapeOutline(
			[
				{ type: 'circle', r: 1, cx: 0, cy: 0 },
				{ type: 'circle', r: 0.2, cx: 0.3, cy: 0 }
			],
			tol
		);
		if (!('outline' in result) || result.outline.kind !== 'polygon')
			throw new Error('expected a polygon');
		expect(shoelace(result.outline.vertices)).toBeCloseTo(Math.PI, 2);
	});

	const skipped: [string, GerberPadPrimitive[], RegExp][] = [
		['no primitives', [], /no primitives/],
		['a ring (moiré)', [{ type: 'ring', r: 1, width: 0.1, cx: 0, cy: 0 }], /moiré or thermal/],
		['a clip (thermal)', [{ type: 'clip', shape: [], clip: {} }], /moiré or thermal/],
		[
			'an exposure-off cut-out',
			[
				{ type: 'circle', r: 1, cx: 0, cy: 0 },
				{ type: 'layer', polarity: 'clear', box: [] },
				{ type: 'circle', r: 0.2, cx: 0, cy: 0 }
			],
			/exposure-off/
		],
		['a zero circle', [{ type: 'circle', r: 0, cx: 0, cy: 0 }], /zero size/],
		[
			'a zero-area polygon',
			[
				{
					type: 'poly',
					points: [
						[0, 0],
						[1, 0],
						[2, 0]
					]
				}
			],
			/zero area/
		],
		[
			'NaN coordinates',
			[
				{
					type: 'poly',
					points: [
						[0, 0],
						[Number.NaN, 0],
						[0, 1]
					]
				}
			],
			/non-numeric/
		],
		[
			'two separate circles (not convex)',
			[
				{ type: 'circle', r: 0.2, cx: -1, cy: 0 },
				{ type: 'circle', r: 0.2, cx: 1, cy: 0 }
			],
			/non-convex/
		],
		[
			'an L of two rectangles',
			[
				{ type: 'rect', width: 1, height: 0.2, r: 0, cx: 0, cy: 0 },
				{ type: 'rect', width: 0.2, height: 1, r: 0, cx: -0.4, cy: 0.4 }
			],
			/non-convex/
		]
	];
	for (const [name, prims, reason] of skipped) {
		it(`skips ${name}`, () => {
			const result = macroShapeOutline(prims, tol);
			expect('skipReason' in result && result.skipReason).toMatch(reason);
		});
	}
});
