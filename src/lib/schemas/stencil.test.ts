import { describe, it, expect } from 'vitest';
import {
	apertureSchema,
	aperturesPayloadSchema,
	formatIssuePath,
	schemaErrors,
	stencilCreateSchema
} from './stencil';

describe('apertureSchema', () => {
	it('fills position and rotation defaults', () => {
		expect(
			apertureSchema.parse({ refdes: 'U1', pad: '1', shape: 'circle', diameterUm: 300 })
		).toEqual({
			refdes: 'U1',
			pad: '1',
			shape: 'circle',
			diameterUm: 300,
			xUm: 0,
			yUm: 0,
			rotationDeg: 0
		});
	});
	it('accepts rectangle with a corner radius, rounded-rectangle and polygon', () => {
		expect(
			apertureSchema.safeParse({
				refdes: 'U1',
				pad: '1',
				shape: 'rectangle',
				lengthUm: 1000,
				widthUm: 300,
				cornerRadiusUm: 100
			}).success
		).toBe(true);
		expect(
			apertureSchema.safeParse({
				refdes: 'U1',
				pad: '1',
				shape: 'rounded-rectangle',
				lengthUm: 1000,
				widthUm: 300,
				cornerRadiusUm: 150
			}).success
		).toBe(true);
		expect(
			apertureSchema.safeParse({
				refdes: 'Q1',
				pad: '1',
				shape: 'polygon',
				verticesUm: [
					[0, 0],
					[100, 0],
					[0, 100]
				]
			}).success
		).toBe(true);
	});
});

describe('aperturesPayloadSchema error paths name the index', () => {
	const cases: { name: string; item: unknown; path: string; text: RegExp }[] = [
		{
			name: 'negative width',
			item: { refdes: 'U1', pad: '1', shape: 'rectangle', lengthUm: 1000, widthUm: -1 },
			path: 'apertures[1].widthUm',
			text: /too small/i
		},
		{
			name: 'missing diameter',
			item: { refdes: 'U1', pad: '1', shape: 'circle' },
			path: 'apertures[1].diameterUm',
			text: /expected number/
		},
		{
			name: 'unknown shape',
			item: { refdes: 'U1', pad: '1', shape: 'triangle' },
			path: 'apertures[1].shape',
			text: /Invalid/
		},
		{
			name: 'radius over half width (geometric check)',
			item: {
				refdes: 'U1',
				pad: '1',
				shape: 'rectangle',
				lengthUm: 1000,
				widthUm: 200,
				cornerRadiusUm: 150
			},
			path: 'apertures[1].cornerRadiusUm',
			text: /exceeds half/
		},
		{
			name: 'rounded-rectangle without radius',
			item: { refdes: 'U1', pad: '1', shape: 'rounded-rectangle', lengthUm: 1000, widthUm: 200 },
			path: 'apertures[1].cornerRadiusUm',
			text: /needs a corner radius/
		},
		{
			name: 'self-intersecting polygon',
			item: {
				refdes: 'Q1',
				pad: '1',
				shape: 'polygon',
				verticesUm: [
					[0, 0],
					[2, 2],
					[2, 0],
					[0, 2]
				]
			},
			path: 'apertures[1].verticesUm',
			text: /intersects itself/
		},
		{
			name: 'absurd size',
			item: { refdes: 'U1', pad: '1', shape: 'circle', diameterUm: 1e6 },
			path: 'apertures[1].diameterUm',
			text: /too big/i
		}
	];
	const ok = { refdes: 'U1', pad: '0', shape: 'circle', diameterUm: 300 };
	for (const c of cases)
		it(c.name, () => {
			const r = aperturesPayloadSchema.safeParse({ apertures: [ok, c.item] });
			expect(r.success).toBe(false);
			const errs = schemaErrors(r.error!);
			expect(errs).toHaveLength(1);
			expect(errs[0].path).toBe(c.path);
			expect(errs[0].message).toMatch(c.text);
		});
	it('rejects an empty list and more than 50,000', () => {
		expect(aperturesPayloadSchema.safeParse({ apertures: [] }).success).toBe(false);
		const big = { apertures: new Array(50001).fill(ok) };
		expect(schemaErrors(aperturesPayloadSchema.safeParse(big).error!)[0].path).toBe('apertures');
	});
});

describe('stencilCreateSchema', () => {
	const base = {
		name: 'Controller board top',
		revision: 'B',
		thicknessUm: 120,
		technology: 'laser-stainless'
	};
	it('accepts a minimal body and optional fields', () => {
		expect(stencilCreateSchema.parse(base)).toEqual(base);
		const full = {
			...base,
			ratedLifePrints: 80000,
			notes: 'fictional example',
			stepRegions: [{ xMinUm: 0, yMinUm: 0, xMaxUm: 10, yMaxUm: 10, thicknessUm: 100 }]
		};
		expect(stencilCreateSchema.parse(full)).toEqual(full);
	});
	const bad: [string, Record<string, unknown>, string][] = [
		['empty name', { name: ' ' }, 'name'],
		['zero thickness', { thicknessUm: 0 }, 'thicknessUm'],
		['unknown technology', { technology: 'etched' }, 'technology'],
		['fractional rated life', { ratedLifePrints: 1.5 }, 'ratedLifePrints'],
		[
			'inverted step region',
			{ stepRegions: [{ xMinUm: 5, yMinUm: 0, xMaxUm: 1, yMaxUm: 1, thicknessUm: 80 }] },
			'stepRegions[0].xMaxUm'
		]
	];
	for (const [name, patch, path] of bad)
		it(name, () => {
			const r = stencilCreateSchema.safeParse({ ...base, ...patch });
			expect(r.success).toBe(false);
			expect(schemaErrors(r.error!).map((e) => e.path)).toEqual([path]);
		});
});

describe('formatIssuePath', () => {
	const cases: [PropertyKey[], string][] = [
		[[], ''],
		[['name'], 'name'],
		[['apertures', 3, 'widthUm'], 'apertures[3].widthUm'],
		[['apertures', 0, 'verticesUm', 2, 1], 'apertures[0].verticesUm[2][1]']
	];
	for (const [p, s] of cases) it(s || '(empty)', () => expect(formatIssuePath(p)).toBe(s));
});
