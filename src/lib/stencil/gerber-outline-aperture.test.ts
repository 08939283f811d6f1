import { describe, it, expect } from 'vitest';
import { MICROMETRES_PER } from '../units';
import { boxesOverlap, gerberOutlineBox, gerberOutlineToAperture } from './gerber-outline-aperture';

describe('gerberOutlineToAperture', () => {
	it('scales inches by 25 400 µm/in (1 in = 25.4 mm exactly) and adds the outline offset', () => {
		const a = gerberOutlineToAperture(
			{
				kind: 'rectangle',
				length: 0.04,
				width: 0.02,
				cornerRadius: 0,
				cx: 0.1,
				cy: 0,
				rotationDeg: 15
			},
			1,
			-0.5,
			MICROMETRES_PER.inch
		);
		expect(a).toEqual({
			refdes: '',
			pad: '',
			xUm: 27940,
			yUm: -12700,
			shape: 'rectangle',
			lengthUm: 1016,
			widthUm: 508,
			rotationDeg: 15
		});
	});

	it('makes a rectangle with a corner radius a rounded rectangle', () => {
		const a = gerberOutlineToAperture(
			{
				kind: 'rectangle',
				length: 1.6,
				width: 0.8,
				cornerRadius: 0.4,
				cx: 0,
				cy: 0,
				rotationDeg: 0
			},
			0,
			0,
			MICROMETRES_PER.mm
		);
		expect(a.shape).toBe('rounded-rectangle');
		expect(a.cornerRadiusUm).toBe(400);
	});

	it('scales polygon vertices and leaves the input unchanged', () => {
		const outline = {
			kind: 'polygon' as const,
			vertices: [
				[0, 0],
				[1, 0],
				[0, 1]
			] as [number, number][],
			cx: 0,
			cy: 0,
			rotationDeg: 0
		};
		const before = structuredClone(outline);
		const a = gerberOutlineToAperture(outline, 2, 3, MICROMETRES_PER.mm);
		expect(a.verticesUm).toEqual([
			[0, 0],
			[1000, 0],
			[0, 1000]
		]);
		expect([a.xUm, a.yUm]).toEqual([2000, 3000]);
		expect(outline).toEqual(before);
	});
});

describe('gerberOutlineBox and boxesOverlap', () => {
	it('boxes a circle', () => {
		expect(gerberOutlineBox({ kind: 'circle', diameter: 2, cx: 1, cy: 0 }, 5, 5)).toEqual([
			5, 4, 7, 6
		]);
	});

	it('boxes a square turned 45°: half-diagonal √2/2 each way', () => {
		const box = gerberOutlineBox(
			{ kind: 'rectangle', length: 1, width: 1, cornerRadius: 0, cx: 0, cy: 0, rotationDeg: 45 },
			0,
			0
		);
		for (const [got, want] of box.map((v, i) => [v, [-1, -1, 1, 1][i] * Math.SQRT1_2])) {
			expect(got).toBeCloseTo(want, 12);
		}
	});

	const overlaps: [string, number[], number[], boolean][] = [
		['overlapping', [0, 0, 2, 2], [1, 1, 3, 3], true],
		['one inside the other', [0, 0, 10, 10], [4, 4, 5, 5], true],
		['touching edges only', [0, 0, 1, 1], [1, 0, 2, 1], false],
		['apart', [0, 0, 1, 1], [5, 5, 6, 6], false]
	];
	for (const [name, a, b, want] of overlaps) {
		it(`boxesOverlap: ${name}`, () => {
			expect(boxesOverlap(a, b)).toBe(want);
			expect(boxesOverlap(b, a)).toBe(want);
		});
	}
});
