import { describe, it, expect } from 'vitest';
import { detectRunRules, RULE_IDS, type RuleId } from './run-rules';
import { zoneBoundaries, zonePosition } from './zones';

// σ = 1 around 0, so values read directly in sigma units.
const LIMITS = { lcl: -3, cl: 0, ucl: 3 };
/** Neutral filler: ≤ 2 points per side in a row, mixed zones, no trend, no alternation. */
const F = [0.5, 1.5, -0.5, -1.5];
const filler = (times: number) => Array.from({ length: times }, () => F).flat();

function fired(series: number[], rule: RuleId) {
	return detectRunRules(series, LIMITS, [rule]);
}
const at = (series: number[], rule: RuleId) => fired(series, rule).map((h) => h.index);

describe('the filler series is quiet for every rule', () => {
	it.each(RULE_IDS.map((r) => [r]))('%s never fires on 40 filler points', (rule) => {
		expect(fired(filler(10), rule)).toEqual([]);
	});
});

describe('we-1 / nelson-1: one point beyond a control limit (strict)', () => {
	it.each([
		[3.5, [8]],
		[-3.0001, [8]],
		[3, []],
		[-3, []]
	])('value %f at index 8 → %j', (value, expected) => {
		const s = [...filler(2), value, ...filler(2)];
		expect(at(s, 'we-1')).toEqual(expected);
		expect(at(s, 'nelson-1')).toEqual(expected);
	});
	it('reports the point itself', () => {
		expect(fired([0, 9, 0], 'we-1')).toEqual([{ rule: 'we-1', index: 1, points: [1] }]);
	});
});

describe('we-2 / nelson-5: 2 of 3 beyond 2σ on the same side', () => {
	it('fires at the completing point with the two qualifying points', () => {
		const s = [...filler(2), 2.5, 0.5, 2.5, ...filler(2)];
		expect(fired(s, 'we-2')).toEqual([{ rule: 'we-2', index: 10, points: [8, 10] }]);
		expect(at(s, 'nelson-5')).toEqual([10]);
	});
	it.each([
		['opposite sides', [2.5, 0.5, -2.5], []],
		['exactly on the 2σ line is not beyond', [2, 0.5, 2.5], []],
		['below the centre line', [-2.5, -2.5, 0.2], [9]],
		['a point beyond 3σ counts as beyond 2σ', [3.5, 0.2, 2.1], [10]]
	])('%s', (_label, pattern, expected) => {
		expect(at([...filler(2), ...pattern, ...filler(2)], 'we-2')).toEqual(expected);
	});
	it('needs a full 3-point window and the completing point must qualify', () => {
		expect(at([2.5, 2.5, 0.5, ...filler(2)], 'we-2')).toEqual([]);
		expect(fired([2.5, 2.5, 2.5], 'we-2')).toEqual([{ rule: 'we-2', index: 2, points: [0, 1, 2] }]);
	});
});

describe('we-3 / nelson-6: 4 of 5 beyond 1σ on the same side', () => {
	it('fires once at index 12', () => {
		const s = [...filler(2), 1.5, 1.5, 0.2, 1.5, 1.5, ...filler(2)];
		expect(fired(s, 'we-3')).toEqual([{ rule: 'we-3', index: 12, points: [8, 9, 11, 12] }]);
		expect(at(s, 'nelson-6')).toEqual([12]);
	});
	it('exactly on the 1σ line does not count', () => {
		expect(at([...filler(2), 1.5, 1.5, 0.2, 1, 1.5, ...filler(2)], 'we-3')).toEqual([]);
	});
});

describe('we-4 (8) and nelson-2 (9): points in a row on one side', () => {
	const flip = [-0.5, -1.5, 0.5, 1.5];
	const s = [...filler(2), ...new Array(10).fill(0.5), ...flip, ...flip];
	it('a run of 10 above fires we-4 at the 8th, 9th and 10th point', () => {
		expect(at(s, 'we-4')).toEqual([15, 16, 17]);
		expect(fired(s, 'we-4')[0].points).toEqual([8, 9, 10, 11, 12, 13, 14, 15]);
	});
	it('and nelson-2 at the 9th and 10th', () => {
		expect(at(s, 'nelson-2')).toEqual([16, 17]);
	});
	it('a point exactly on the centre line breaks the run', () => {
		const broken = [...filler(2), 0.5, 0.5, 0.5, 0.5, 0, 0.5, 0.5, 0.5, 0.5, ...flip];
		expect(at(broken, 'we-4')).toEqual([]);
	});
	it('runs below the centre line count too', () => {
		expect(at([...new Array(8).fill(-0.1)], 'we-4')).toEqual([7]);
	});
});

describe('nelson-3: 6 points in a row steadily increasing or decreasing', () => {
	it('fires at the 6th point of the trend', () => {
		const s = [...filler(2), -2, -1, 0, 1, 2, 2.5, ...filler(2)];
		expect(fired(s, 'nelson-3')).toEqual([
			{ rule: 'nelson-3', index: 13, points: [8, 9, 10, 11, 12, 13] }
		]);
	});
	it('a tie breaks the trend; 7 falling points fire twice', () => {
		expect(at([...filler(2), -2, -1, 0, 0, 1, 2, 2.5, ...filler(2)], 'nelson-3')).toEqual([]);
		expect(at([...filler(2), 2.5, 2, 1, 0, -1, -2, -2.5, ...filler(2)], 'nelson-3')).toEqual([
			13, 14
		]);
	});
	it('5 rises are needed: 5 increasing points do not fire', () => {
		expect(at([...filler(2), -2, -1, 0, 1, 2, ...filler(2)], 'nelson-3')).toEqual([]);
	});
});

describe('nelson-4: 14 points in a row alternating up and down', () => {
	// idx 7 = −1.5 and idx 8 = −1.5 tie, so the alternation starts at idx 8.
	const alt = Array.from({ length: 13 }, (_, i) => (i % 2 === 0 ? 0.5 : -0.5));
	it('fires at the 14th alternating point only', () => {
		const s = [...filler(2), -1.5, ...alt, alt[12], ...filler(2)];
		expect(fired(s, 'nelson-4')).toEqual([
			{ rule: 'nelson-4', index: 21, points: Array.from({ length: 14 }, (_, i) => 8 + i) }
		]);
	});
	it('13 alternating points do not fire; a tie inside breaks it', () => {
		expect(
			at([...filler(2), -1.5, ...alt.slice(0, 12), alt[11], ...filler(2)], 'nelson-4')
		).toEqual([]);
		const tied = [...alt];
		tied[6] = tied[5];
		expect(at([...filler(2), -1.5, ...tied, tied[12], ...filler(2)], 'nelson-4')).toEqual([]);
	});
});

describe('nelson-7: 15 points in a row within 1σ', () => {
	const zoneC = [0.2, -0.3, 0.9, 1, 0, -1, 0.4, -0.4, 0.1, 0.1, -0.2, 0.6, -0.6, 0.3, 0.2, -0.1];
	it('16 zone-C points (on the 1σ line and on the centre line included) fire at the 15th and 16th', () => {
		const s = [...filler(2), ...zoneC, 1.5, ...filler(2)];
		expect(at(s, 'nelson-7')).toEqual([22, 23]);
	});
	it('one point beyond 1σ in the middle prevents it', () => {
		const broken = [...zoneC];
		broken[7] = -1.01;
		expect(at([...filler(2), ...broken, 1.5, ...filler(2)], 'nelson-7')).toEqual([]);
	});
});

describe('nelson-8: 8 points in a row beyond 1σ on both sides', () => {
	it('fires where 8 consecutive points are all outside Zone C with both sides present', () => {
		// idx 7 is −1.5 (beyond 1σ), so the run is idx 7..15.
		const s = [...filler(2), 1.5, -1.5, 2.5, -2.5, 1.2, -1.2, 1.5, -1.5, ...filler(2)];
		expect(at(s, 'nelson-8')).toEqual([14, 15]);
	});
	it.each([
		['all on one side', [1.5, 1.5, 2.5, 2.5, 1.2, 1.2, 1.5, 1.5]],
		['one point exactly on the 1σ line', [1.5, -1.5, 2.5, -2.5, 1, -1.2, 1.5, -1.5]]
	])('does not fire with %s', (_label, pattern) => {
		expect(at([...filler(2), 0.1, ...pattern, ...filler(2)], 'nelson-8')).toEqual([]);
	});
});

describe('zones and general behaviour', () => {
	it('asymmetric limits give a σ per side; clipped LCL uses the upper σ', () => {
		const z = zoneBoundaries({ lcl: 4, cl: 10, ucl: 19 });
		expect(z.upper).toEqual([10, 13, 16, 19]);
		expect(z.lower).toEqual([10, 8, 6, 4]);
		const clipped = zoneBoundaries({ lcl: 0, cl: 2, ucl: 8 }, true);
		expect(clipped.lower).toEqual([2, 0, -2, 0]);
		expect(zonePosition(16, z)).toEqual({ side: 1, level: 1 });
		expect(zonePosition(5.9, z)).toEqual({ side: -1, level: 2 });
	});
	it('non-finite values never signal and break windows', () => {
		expect(at([9, NaN, Infinity, 0.5, 0.5], 'we-1')).toEqual([0]);
		expect(at([...new Array(4).fill(0.5), NaN, ...new Array(4).fill(0.5)], 'we-4')).toEqual([]);
	});
	it('empty and single-point series give no violations', () => {
		for (const rule of RULE_IDS) {
			expect(fired([], rule)).toEqual([]);
			expect(fired([0.5], rule)).toEqual([]);
		}
	});
	it('collapsed limits (zero spread) flag any point off the centre line, without NaN', () => {
		expect(detectRunRules([5, 5, 5.1], { lcl: 5, cl: 5, ucl: 5 }, ['we-1'])).toEqual([
			{ rule: 'we-1', index: 2, points: [2] }
		]);
	});
	it('WE and Nelson equivalents agree on a pseudo-random series', () => {
		const s = seededNormals(500, 7).map((x) => x * 1.3);
		const idx = (r: RuleId) => detectRunRules(s, LIMITS, [r]).map((h) => h.index);
		expect(idx('we-2')).toEqual(idx('nelson-5'));
		expect(idx('we-3')).toEqual(idx('nelson-6'));
		expect(idx('we-1')).toEqual(idx('nelson-1'));
		// nelson-2 at e implies we-4 at e − 1 and e (REFERENCE-FACTS c)
		const we4 = new Set(idx('we-4'));
		for (const e of idx('nelson-2')) expect(we4.has(e) && we4.has(e - 1)).toBe(true);
	});
	it('an unknown rule id is refused', () => {
		expect(() => detectRunRules([1], LIMITS, ['we-9' as RuleId])).toThrow(/unknown rule "we-9"/);
	});
	it('sanity: fixed-seed in-control series has a plausible false-alarm count (not a rate test)', () => {
		// Expected roughly 5000/370 ≈ 14 we-1 signals and 5000/92 ≈ 55 for all four WE rules
		// (Champ & Woodall 1987); bounds are loose — this only guards against gross errors.
		const s = seededNormals(5000, 42);
		const we1 = detectRunRules(s, LIMITS, ['we-1']).length;
		const firstSignals = new Set(detectRunRules(s, LIMITS).map((h) => h.index)).size;
		console.info(`in-control 5000 points: we-1 ${we1}, points flagged by WE rules ${firstSignals}`);
		expect(we1).toBeGreaterThan(2);
		expect(we1).toBeLessThan(40);
		expect(firstSignals).toBeLessThan(250);
	});
});

/** Box–Muller normals from a 32-bit LCG (Numerical Recipes constants), reproducible. */
function seededNormals(count: number, seed: number): number[] {
	let state = seed >>> 0;
	const uniform = () => {
		state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
		return (state + 0.5) / 4294967296;
	};
	return Array.from(
		{ length: count },
		() => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform())
	);
}
