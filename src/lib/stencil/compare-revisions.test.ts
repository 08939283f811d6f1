import { describe, it, expect } from 'vitest';
import { compareRevisions } from './compare-revisions';
import { circle, rect } from './test-fixtures';

const revA = [
	rect(1000, 200, { refdes: 'U1', pad: '1', xUm: 0, yUm: 0 }),
	rect(1000, 200, { refdes: 'U1', pad: '2', xUm: 0, yUm: 400 }),
	circle(300, { refdes: 'U2', pad: 'A1', xUm: 5000, yUm: 0 }),
	rect(300, 280, { refdes: 'C1', pad: '1', xUm: 9000, yUm: 0 }),
	rect(500, 500, { refdes: '', pad: '', xUm: 20000, yUm: 0 })
];
const revB = [
	rect(1000, 180, { refdes: 'U1', pad: '1', xUm: 0, yUm: 0 }), // narrowed
	rect(1000, 200, { refdes: 'U1', pad: '2', xUm: 0, yUm: 400, rotationDeg: 180 }), // same opening
	circle(300, { refdes: 'U2', pad: 'A1', xUm: 5000, yUm: 0, rotationDeg: 45 }), // same
	rect(500, 500, { refdes: '', pad: '', xUm: 20020, yUm: 0 }), // moved 20 µm, matched by position
	rect(400, 400, { refdes: 'C9', pad: '1', xUm: 30000, yUm: 0 }) // new
];

describe('compareRevisions', () => {
	const c = compareRevisions(revA, revB, { oldThicknessUm: 120, newThicknessUm: 100 });
	const sameFoil = compareRevisions(revA, revB, { oldThicknessUm: 120, newThicknessUm: 120 });
	it('added, removed and unchanged (same foil)', () => {
		expect(sameFoil.added.map((a) => a.aperture.refdes)).toEqual(['C9']);
		expect(sameFoil.removed.map((a) => a.aperture.refdes)).toEqual(['C1']);
		expect(sameFoil.unchangedCount).toBe(2);
		expect(sameFoil.stencilChanges).toEqual([]);
	});
	it('same foil: changed pairs name the geometry fields and the ratios that follow', () => {
		expect(sameFoil.changed.map((x) => [x.matchedBy, x.fields])).toEqual([
			['refdes-pad', ['widthUm', 'areaRatio', 'aspectRatio']],
			['position', ['position']]
		]);
	});
	it('a thinner foil changes every ratio: every matched aperture is changed, and the thickness is named (issue 13)', () => {
		expect(c.unchangedCount).toBe(0);
		expect(c.changed.map((x) => [x.matchedBy, x.fields])).toEqual([
			['refdes-pad', ['widthUm', 'areaRatio', 'aspectRatio']],
			['refdes-pad', ['areaRatio', 'aspectRatio']],
			['refdes-pad', ['areaRatio', 'aspectRatio']],
			['position', ['position', 'areaRatio', 'aspectRatio']]
		]);
		expect(c.stencilChanges).toEqual([{ field: 'thicknessUm', old: 120, new: 100 }]);
	});
	it('a technology change is named', () => {
		const t = compareRevisions(revA, revA, {
			oldThicknessUm: 120,
			newThicknessUm: 120,
			oldTechnology: 'laser-cut',
			newTechnology: 'electroformed'
		});
		expect(t.stencilChanges).toEqual([
			{ field: 'technology', old: 'laser-cut', new: 'electroformed' }
		]);
		expect(t.unchangedCount).toBe(revA.length);
	});
	it('changed pairs carry both sides’ ratios at their own thickness', () => {
		const u1 = c.changed[0];
		expect(u1.old.areaRatio).toBeCloseTo(200000 / (2400 * 120), 12);
		expect(u1.new.areaRatio).toBeCloseTo(180000 / (2360 * 100), 12);
		expect(u1.old.aspectRatio).toBeCloseTo(200 / 120, 12);
		expect(u1.new.minDimensionUm).toBe(180);
	});
	it('identical revisions: everything unchanged', () => {
		const same = compareRevisions(revA, revA, { oldThicknessUm: 120, newThicknessUm: 120 });
		expect(same).toMatchObject({
			added: [],
			removed: [],
			changed: [],
			unchangedCount: revA.length
		});
	});
	it('beyond the position tolerance an unnamed aperture is removed + added', () => {
		const far = compareRevisions(
			revA.slice(4),
			[rect(500, 500, { refdes: '', pad: '', xUm: 20100 })],
			{
				oldThicknessUm: 120,
				newThicknessUm: 120,
				positionToleranceUm: 50
			}
		);
		expect([far.added.length, far.removed.length]).toEqual([1, 1]);
	});
	it('empty revisions', () => {
		expect(compareRevisions([], revB, { oldThicknessUm: 1, newThicknessUm: 1 }).added).toHaveLength(
			5
		);
		expect(
			compareRevisions(revA, [], { oldThicknessUm: 1, newThicknessUm: 1 }).removed
		).toHaveLength(5);
	});
	it('bad options and bad apertures throw clear errors', () => {
		expect(() => compareRevisions(revA, revB, { oldThicknessUm: 0, newThicknessUm: 100 })).toThrow(
			/revision comparison, oldThicknessUm/
		);
		expect(() =>
			compareRevisions([rect(0, 1)], [], { oldThicknessUm: 1, newThicknessUm: 1 })
		).toThrow(/U1\.1, lengthUm/);
	});
});

describe('compareRevisions with apertures piled on one spot (hostile input)', () => {
	const unnamed = (n: number, spread: (i: number) => number) =>
		Array.from({ length: n }, (_, i) =>
			circle(300, { refdes: '', pad: '', xUm: spread(i), yUm: 0 })
		);

	it('20,000 duplicates at one point pair up at once (a taken aperture leaves its cell)', () => {
		const r = compareRevisions(
			unnamed(20_000, () => 0),
			unnamed(20_000, () => 0),
			{
				oldThicknessUm: 120,
				newThicknessUm: 120
			}
		);
		expect(r.unchangedCount).toBe(20_000);
		expect(r.note).toBeUndefined();
	});

	it('7,000 apertures within one 50 µm cell stop matching by position after the test budget, and say so', () => {
		// Distinct positions 0.005 µm apart, never equal: every new one measures every free old one.
		const spread = (i: number) => i * 0.005;
		const r = compareRevisions(
			unnamed(7_000, spread),
			unnamed(7_000, (i) => spread(i) + 0.0025),
			{
				oldThicknessUm: 120,
				newThicknessUm: 120
			}
		);
		expect(r.note).toMatch(
			/^matching by position stopped at new aperture #\d+ after 20000000 distance tests/
		);
		const matched = r.unchangedCount + r.changed.length;
		expect(matched + r.added.length).toBe(7_000);
		expect(matched + r.removed.length).toBe(7_000);
		expect(r.added.length).toBeGreaterThan(0);
	});
});
