import { describe, it, expect } from 'vitest';
import { checkStepRegions, localThickness } from './step-regions';
import { polygon, rect } from './test-fixtures';

const regions = [
	{ xMinUm: 0, yMinUm: 0, xMaxUm: 10000, yMaxUm: 10000, thicknessUm: 100 },
	{ xMinUm: 2000, yMinUm: 2000, xMaxUm: 4000, yMaxUm: 4000, thicknessUm: 80 }
];

describe('localThickness', () => {
	const cases = [
		{ name: 'outside every region → base', x: 20000, y: 0, t: 120 },
		{ name: 'inside the broad region', x: 5000, y: 5000, t: 100 },
		{ name: 'inside both: last listed wins', x: 3000, y: 3000, t: 80 },
		{ name: 'on the boundary counts as inside', x: 10000, y: 10000, t: 100 },
		{ name: 'just outside the boundary', x: 10000.001, y: 5000, t: 120 }
	];
	for (const c of cases)
		it(c.name, () =>
			expect(localThickness(rect(200, 200, { xUm: c.x, yUm: c.y }), 120, regions)).toBe(c.t)
		);
	it('no regions → base thickness', () => expect(localThickness(rect(200, 200), 127)).toBe(127));
	it('a polygon uses its area centroid, not its reference point', () => {
		// Reference point (9000, 0) is outside region 2, centroid (9000+... ) stays outside too;
		// a square offset so its centroid lands at (3000, 3000):
		const p = polygon(
			[
				[2900, 2900],
				[3100, 2900],
				[3100, 3100],
				[2900, 3100]
			],
			{ xUm: 0, yUm: 0 }
		);
		expect(localThickness(p, 120, regions)).toBe(80);
	});
	it('rejects a bad base thickness and bad regions with field names', () => {
		expect(() => localThickness(rect(1, 1), 0, [])).toThrow(
			/stencil, thicknessUm: must be greater than 0/
		);
		expect(() =>
			localThickness(rect(1, 1), 100, [
				{ xMinUm: 5, yMinUm: 0, xMaxUm: 1, yMaxUm: 1, thicknessUm: 80 }
			])
		).toThrow(/stepRegions\[0\], xMaxUm: must not be less than xMinUm/);
	});
});

describe('checkStepRegions', () => {
	it('lists every problem', () => {
		const p = checkStepRegions([
			{ xMinUm: 0, yMinUm: 0, xMaxUm: 1, yMaxUm: 1, thicknessUm: 0 },
			{ xMinUm: NaN, yMinUm: 0, xMaxUm: 1, yMaxUm: -1, thicknessUm: 80 }
		]);
		expect(p.map((q) => `${q.where}.${q.field}`)).toEqual([
			'stepRegions[0].thicknessUm',
			'stepRegions[1].xMinUm'
		]);
	});
	it('valid regions → no problems', () => expect(checkStepRegions(regions)).toEqual([]));
});
