import { describe, it, expect } from 'vitest';
import type { ApertureInput } from './aperture';
import { nameGerberApertures } from './gerber-naming';

const pad = (xUm: number, yUm: number): ApertureInput => ({
	refdes: '',
	pad: '',
	shape: 'circle',
	diameterUm: 300,
	xUm,
	yUm,
	rotationDeg: 0
});

describe('nameGerberApertures', () => {
	it('returns nothing for nothing', () => {
		expect(nameGerberApertures([])).toEqual([]);
	});

	it('names a single aperture @0001, pad 1', () => {
		expect(nameGerberApertures([pad(5, 5)])).toEqual([{ ...pad(5, 5), refdes: '@0001', pad: '1' }]);
	});

	it('sorts by y, then x, both ascending', () => {
		const named = nameGerberApertures([pad(10, 5), pad(0, 5), pad(99, 0)]);
		expect(named.map((a) => [a.refdes, a.xUm, a.yUm])).toEqual([
			['@0001', 99, 0],
			['@0002', 0, 5],
			['@0003', 10, 5]
		]);
	});

	it('treats positions within float noise as one row (rounded to whole µm)', () => {
		const named = nameGerberApertures([pad(20, 1000.0000001), pad(10, 999.9999999)]);
		expect(named.map((a) => a.xUm)).toEqual([10, 20]);
	});

	it('keeps file order for apertures at the same position', () => {
		const a = { ...pad(0, 0), diameterUm: 100 };
		const b = { ...pad(0, 0), diameterUm: 200 };
		expect(nameGerberApertures([a, b]).map((x) => x.diameterUm)).toEqual([100, 200]);
	});

	it('widens the number beyond 9999 apertures so names still sort as text', () => {
		const many = Array.from({ length: 10000 }, (_, i) => pad(i, 0));
		const named = nameGerberApertures(many);
		expect(named[0].refdes).toBe('@00001');
		expect(named[9999].refdes).toBe('@10000');
	});

	it('does not change its input', () => {
		const input = [pad(1, 1)];
		const before = structuredClone(input);
		nameGerberApertures(input);
		expect(input).toEqual(before);
	});
});
