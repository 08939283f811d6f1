import { describe, it, expect } from 'vitest';
import powderRef from '../../../reference/stencil/j-std-005-powder.json';
import examples from '../../../reference/stencil/worked-examples.json';
import {
	largestParticleUm,
	minApertureWidthUm,
	POWDER_SIZES,
	powderWarnings,
	suggestPowderType,
	type PowderType
} from './powder';
import { circle, rect } from './test-fixtures';

describe('J-STD-005 table matches the reference file', () => {
	for (const ref of powderRef.types)
		it(`Type ${ref.type}`, () => {
			const row = POWDER_SIZES.find((p) => p.type === ref.type)!;
			expect([row.mainRangeMinUm, row.mainRangeMaxUm]).toEqual(ref.mainRangeUm);
			expect(row.noneLargerThanUm).toBe(ref.noneLargerThanUm);
			expect(row.underOnePercentLargerThanUm).toBe(ref.underOnePercentLargerThanUm);
			expect(row.maxTenPercentSmallerThanUm).toBe(ref.maxTenPercentSmallerThanUm);
		});
	it('types get finer monotonically', () => {
		for (let i = 1; i < POWDER_SIZES.length; i++)
			expect(POWDER_SIZES[i].mainRangeMaxUm).toBeLessThan(POWDER_SIZES[i - 1].mainRangeMaxUm);
	});
});

describe('five-ball minimum widths (SMT007 July 2019 method: T3 225, T4 190, T5 125, T6 75, T7 55)', () => {
	for (const [type, width] of Object.entries(examples.fiveBallRule.minimumApertureWidthUm))
		it(`Type ${type} → ${width} µm`, () =>
			expect(minApertureWidthUm(Number(type) as PowderType)).toBe(width));
	it('a different particle count scales it (eight-ball variant)', () =>
		expect(minApertureWidthUm(4, 8)).toBe(304));
	it('unknown type throws', () =>
		expect(() => largestParticleUm(9 as PowderType)).toThrow(/unknown J-STD-005 type 9/));
});

describe('suggestPowderType', () => {
	it('0.4 mm-pitch QFP (200 µm) → Type 4; 0201 (280 µm) → Type 3 (worked examples)', () => {
		expect(suggestPowderType([rect(1000, 200)]).type).toBe(4);
		expect(suggestPowderType([rect(300, 280)]).type).toBe(3);
	});
	it('the narrowest aperture decides, and is reported', () => {
		const s = suggestPowderType([
			rect(300, 280, { refdes: 'C1' }),
			rect(1000, 200, { refdes: 'U7', pad: '12' })
		]);
		expect(s).toMatchObject({
			type: 4,
			limitingIndex: 1,
			limitingLabel: 'U7.12',
			limitingMinDimensionUm: 200
		});
		expect(s.message).toContain('U7.12');
	});
	const boundary = [
		{ d: 225, type: 3, note: 'exactly 5 × 45 fits Type 3' },
		{ d: 224.9, type: 4, note: 'just under needs Type 4' },
		{ d: 750, type: 1, note: 'exactly 5 × 150 fits Type 1' },
		{ d: 40, type: 8, note: '40 µm needs Type 8 (5 × 8)' },
		{ d: 39, type: null, note: 'nothing fits below 40 µm' }
	];
	for (const b of boundary)
		it(b.note, () => expect(suggestPowderType([circle(b.d)]).type).toBe(b.type));
	it('empty list → null type with a message', () => {
		expect(suggestPowderType([])).toMatchObject({
			type: null,
			limitingIndex: null,
			message: 'no apertures to suggest a powder type for'
		});
	});
});

describe('powderWarnings', () => {
	it('Type 3 paste on a 200 µm aperture: 4.44 particles across, one warning', () => {
		const w = powderWarnings([rect(1000, 200), rect(300, 280)], 3);
		expect(w).toHaveLength(1);
		expect(w[0].index).toBe(0);
		expect(w[0].particlesAcross).toBeCloseTo(200 / 45, 12);
		expect(w[0].message).toMatch(/only 4\.44 Type 3 particles/);
	});
	it('no warnings when all fit', () => expect(powderWarnings([rect(1000, 200)], 4)).toEqual([]));
});
