import { describe, it, expect } from 'vitest';
import { regularPolygonVertices, standardApertureOutline } from './gerber-standard-outline';

describe('standardApertureOutline (Gerber standard templates C, R, O, P)', () => {
	const cases = [
		{ shape: 'circle', params: [0.5], want: { kind: 'circle', diameter: 0.5, cx: 0, cy: 0 } },
		{
			shape: 'rect',
			params: [1.2, 0.6],
			want: {
				kind: 'rectangle',
				length: 1.2,
				width: 0.6,
				cornerRadius: 0,
				cx: 0,
				cy: 0,
				rotationDeg: 0
			}
		},
		// An obround is a stadium: corner radius = half the smaller side.
		{
			shape: 'obround',
			params: [0.8, 1.6],
			want: {
				kind: 'rectangle',
				length: 0.8,
				width: 1.6,
				cornerRadius: 0.4,
				cx: 0,
				cy: 0,
				rotationDeg: 0
			}
		},
		{ shape: 'obround', params: [1, 1], want: { kind: 'circle', diameter: 1, cx: 0, cy: 0 } }
	];
	for (const c of cases) {
		it(`${c.shape} ${c.params.join(' × ')}`, () => {
			expect(standardApertureOutline({ shape: c.shape, params: c.params, hole: [] })).toEqual({
				outline: c.want
			});
		});
	}

	it('P: n vertices on the circumscribed circle, first on +x, rotation kept separately', () => {
		const result = standardApertureOutline({ shape: 'poly', params: [1, 6, 30], hole: [] });
		if (!('outline' in result) || result.outline.kind !== 'polygon')
			throw new Error('expected a polygon');
		expect(result.outline.rotationDeg).toBe(30);
		expect(result.outline.vertices.length).toBe(6);
		expect(result.outline.vertices[0]).toEqual([0.5, 0]);
		for (const [x, y] of result.outline.vertices) expect(Math.hypot(x, y)).toBeCloseTo(0.5, 12);
	});

	const skipped = [
		{
			name: 'circle with a hole',
			tool: { shape: 'circle', params: [1], hole: [0.3] },
			reason: /has a hole/
		},
		{
			name: 'rectangle with a rectangular hole',
			tool: { shape: 'rect', params: [1, 1], hole: [0.2, 0.2] },
			reason: /has a hole/
		},
		{
			name: 'zero-size circle',
			tool: { shape: 'circle', params: [0], hole: [] },
			reason: /zero size/
		},
		{
			name: 'zero-width rectangle',
			tool: { shape: 'rect', params: [1, 0], hole: [] },
			reason: /zero size/
		},
		{
			name: 'zero-size polygon',
			tool: { shape: 'poly', params: [0, 4, 0], hole: [] },
			reason: /zero size/
		}
	];
	for (const s of skipped) {
		it(`skips ${s.name}`, () => {
			const result = standardApertureOutline(s.tool);
			expect('skipReason' in result && result.skipReason).toMatch(s.reason);
		});
	}

	const invalid = [
		{
			name: 'negative diameter',
			tool: { shape: 'circle', params: [-1], hole: [] },
			error: /circle diameter must be a number ≥ 0 \(got -1\)/
		},
		{
			name: 'NaN size',
			tool: { shape: 'rect', params: [Number.NaN, 1], hole: [] },
			error: /x size/
		},
		{
			name: 'missing y size',
			tool: { shape: 'obround', params: [1], hole: [] },
			error: /y size must be a number ≥ 0 \(got undefined\)/
		},
		{
			name: 'P with 2 vertices',
			tool: { shape: 'poly', params: [1, 2, 0], hole: [] },
			error: /from 3 to 12 \(got 2\)/
		},
		{
			name: 'P with 13 vertices',
			tool: { shape: 'poly', params: [1, 13, 0], hole: [] },
			error: /got 13/
		},
		{
			name: 'P with 4.5 vertices',
			tool: { shape: 'poly', params: [1, 4.5, 0], hole: [] },
			error: /got 4.5/
		},
		{
			name: 'a macro name',
			tool: { shape: 'RoundRect', params: [1], hole: [] },
			error: /not a standard aperture/
		}
	];
	for (const c of invalid) {
		it(`throws a RangeError on ${c.name}`, () => {
			expect(() => standardApertureOutline(c.tool)).toThrow(c.error);
			expect(() => standardApertureOutline(c.tool)).toThrow(RangeError);
		});
	}
});

describe('regularPolygonVertices', () => {
	// Area of a regular n-gon with circumradius R: (n/2)·R²·sin(2π/n) (first principles).
	for (const n of [3, 4, 6, 12]) {
		it(`${n} vertices: shoelace area equals (n/2)·R²·sin(2π/n)`, () => {
			const v = regularPolygonVertices(2, n);
			let twice = 0;
			for (let i = 0; i < n; i++)
				twice += v[i][0] * v[(i + 1) % n][1] - v[(i + 1) % n][0] * v[i][1];
			expect(twice / 2).toBeCloseTo((n / 2) * Math.sin((2 * Math.PI) / n), 12);
		});
	}
});
