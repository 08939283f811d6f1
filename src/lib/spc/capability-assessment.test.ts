import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { capabilityFromSummary, processCapability } from './capability';
import {
	assessCapability,
	countOutOfSpec,
	cpkLowerBound,
	cpLowerBound,
	thresholdErrors
} from './capability-assessment';
import { cpConfidenceInterval, cpkConfidenceInterval } from './capability-intervals';
import { computeLimits, chartPoints } from './control-chart';
import { evaluateChart } from './evaluate-chart';
import type { RuleId } from './run-rules';

const ref = JSON.parse(readFileSync('reference/spc/capability-bounds.json', 'utf8'));

describe('confidence bounds (reference/spc/capability-bounds.json)', () => {
	it("reproduces Montgomery's two-sided Cp interval (Example 8.5) from chi-square", () => {
		const r = ref.montgomeryCpInterval;
		const i = cpConfidenceInterval(r.cp, r.n, r.confidenceLevel);
		expect(i.lower).toBeCloseTo(r.lower, r.decimals);
		expect(i.upper).toBeCloseTo(r.upper, r.decimals);
	});
	it("reproduces Montgomery's Cpk interval (Example 8.6, Bissell's approximation)", () => {
		const r = ref.montgomeryCpkInterval;
		const i = cpkConfidenceInterval(r.cpk, r.n, r.confidenceLevel);
		expect(i.lower).toBeCloseTo(r.lower, r.decimals);
		expect(i.upper).toBeCloseTo(r.upper, r.decimals);
	});
	it('one-sided lower bounds match the hand computation with table quantiles', () => {
		const { cp, cpk } = ref.oneSidedLowerBounds;
		expect(cpLowerBound(cp.value, cp.n, cp.confidenceLevel)).toBeCloseTo(
			cp.lowerBound,
			cp.decimals
		);
		expect(cpkLowerBound(cpk.value, cpk.n, cpk.confidenceLevel)).toBeCloseTo(
			cpk.lowerBound,
			cpk.decimals
		);
	});
	it('a one-sided 95 % bound lies above the two-sided 95 % lower end (z 1.645 < 1.960)', () => {
		expect(cpkLowerBound(1.5, 30)).toBeGreaterThan(cpkConfidenceInterval(1.5, 30).lower);
		expect(cpLowerBound(1.5, 30)).toBeGreaterThan(cpConfidenceInterval(1.5, 30).lower);
	});
	it('refuses a sample of one and a level outside (0.5, 1)', () => {
		expect(() => cpkLowerBound(1, 1)).toThrow(RangeError);
		expect(() => cpLowerBound(1, 10, 1)).toThrow(RangeError);
	});
});

// Finding 1, first chart: the demo's squeegee-speed runs (mm/s), limits frozen on the first nine.
const SPEED = [41, 43, 42, 41, 42, 42, 38, 38, 40, 65, 37, 38, 36, 44];
const SPEED_RULES: RuleId[] = ['we-1', 'we-2', 'we-3', 'we-4', 'nelson-3'];

function speedChart() {
	const points = chartPoints('i-mr', SPEED);
	const limits = computeLimits('i-mr', points, { exclude: [9, 10, 11, 12, 13] });
	return { points, limits, violations: evaluateChart(points, limits, SPEED_RULES) };
}

describe('stability comes first (finding 1)', () => {
	it('squeegee speed: Cpk over 3 but 8 open signals and flagged points → not stable, no verdict', () => {
		const { limits, violations } = speedChart();
		const cap = processCapability({
			values: SPEED,
			sigmaWithin: limits.sigmaWithin,
			lsl: 30,
			usl: 60,
			target: 40
		});
		expect(cap.cpk).toBeGreaterThan(3);
		expect(cap.ppk).toBeLessThan(0.6);
		const openSignals = Array.from({ length: 8 }, (_, i) => ({
			id: i + 1,
			rule: 'we-1',
			chartPart: 'location',
			point: `run ${10 + i}`
		}));
		const a = assessCapability({
			capability: cap,
			lsl: 30,
			usl: 60,
			openSignals,
			violations,
			pointsShown: SPEED.length,
			observed: countOutOfSpec(SPEED, 30, 60)
		});
		expect(a.verdict).toBe('not-stable');
		expect(a.headline).toBe('Not stable, capability not assessed');
		expect(a.basis).toBeNull();
		expect(a.detail).toContain('8 open signals');
		expect(a.detail).toContain(`flag ${a.stability.flaggedPoints} of the 14 points`);
		expect(a.stability.flaggedPoints).toBeGreaterThan(0);
		// Indices are still shown side by side, with their bounds.
		expect(a.indices?.cpk.value).toBeCloseTo(cap.cpk ?? NaN, 12);
		expect(a.indices?.ppk.lowerBound).toBeLessThan(cap.ppk ?? NaN);
	});

	it('paste volume: 0 open signals in Phase I but the rules flag most points → not stable', () => {
		// Board means drifting down (stencil wear), pads within each board spread as usual.
		const groups = Array.from({ length: 150 }, (_, i) => ({
			n: 400,
			mean: 99 - i * 0.04,
			sd: 9.8
		}));
		const points = groups.map((g, i) => ({
			location: g.mean,
			dispersion: g.sd,
			size: g.n,
			movingRange: i === 0 ? null : Math.abs(g.mean - groups[i - 1].mean)
		}));
		const limits = computeLimits('between-within', points);
		const violations = evaluateChart(points, limits, ['we-1', 'we-2', 'we-3', 'we-4']);
		const cap = capabilityFromSummary({
			n: 150 * 400,
			mean: 96,
			sigmaOverall: 10.3,
			sigmaWithin: limits.sigmaWithin,
			lsl: 50,
			usl: 150
		});
		expect(cap.cpk).toBeGreaterThan(1.33);
		const a = assessCapability({
			capability: cap,
			lsl: 50,
			usl: 150,
			openSignals: [],
			violations,
			pointsShown: 150,
			observed: null
		});
		expect(a.stability.flaggedPoints).toBeGreaterThan(100);
		expect(a.verdict).toBe('not-stable');
		expect(a.detail).toContain(`flag ${a.stability.flaggedPoints} of the 150 points`);
	});

	it('a point above the USL: observed ppm > 0 shown, expected from the overall spread when unstable', () => {
		const { limits, violations } = speedChart();
		const cap = processCapability({
			values: SPEED,
			sigmaWithin: limits.sigmaWithin,
			lsl: 30,
			usl: 60
		});
		// Within σ̂ alone predicts practically nothing above 60 mm/s.
		expect(cap.expectedWithin?.ppmTotal).toBeLessThan(1);
		const a = assessCapability({
			capability: cap,
			lsl: 30,
			usl: 60,
			openSignals: [],
			violations,
			pointsShown: SPEED.length,
			observed: countOutOfSpec(SPEED, 30, 60)
		});
		expect(a.observed).toMatchObject({ n: 14, count: 1, belowLsl: 0 });
		expect(a.observed?.aboveUsl).toBeCloseTo(1e6 / 14, 6);
		expect(a.expected?.spread).toBe('overall');
		expect(a.expected?.total).toBeCloseTo(cap.expectedOverall?.ppmTotal ?? NaN, 6);
		expect(a.expected?.total).toBeGreaterThan(1000);
	});
});

describe('the verdict rests on the lower bound', () => {
	const stableInput = (cpk: number, n: number) => {
		// Centred process: spec ±3·cpk·σ around the mean, σ within = overall = 1.
		const cap = capabilityFromSummary({
			n,
			mean: 0,
			sigmaOverall: 1,
			sigmaWithin: 1,
			lsl: -3 * cpk,
			usl: 3 * cpk
		});
		return {
			capability: cap,
			lsl: -3 * cpk,
			usl: 3 * cpk,
			openSignals: [],
			violations: [],
			pointsShown: 25,
			observed: { n, belowLsl: 0, aboveUsl: 0 }
		};
	};
	it('Cpk 1.45 from 20 values is marginal: its lower bound is below 1.33', () => {
		const a = assessCapability(stableInput(1.45, 20));
		expect(a.basis?.index).toBe('Cpk');
		expect(a.basis?.lowerBound).toBeCloseTo(cpkLowerBound(1.45, 20), 12);
		expect(a.verdict).toBe('marginal');
		expect(a.expected?.spread).toBe('within');
		expect(a.observed?.total).toBe(0);
	});
	it('Cpk 1.45 from 20,000 values is capable', () => {
		expect(assessCapability(stableInput(1.45, 20_000)).verdict).toBe('capable');
	});
	it('Cpk 0.9 is not capable; thresholds are configurable', () => {
		expect(assessCapability(stableInput(0.9, 1000)).verdict).toBe('not-capable');
		const strict = assessCapability({
			...stableInput(1.45, 20_000),
			thresholds: { capable: 1.67 }
		});
		expect(strict.verdict).toBe('marginal');
		expect(strict.thresholds.capable).toBe(1.67);
	});
	it('Ppk applies when the within σ is unknown', () => {
		const cap = capabilityFromSummary({
			n: 500,
			mean: 0,
			sigmaOverall: 1,
			sigmaWithin: null,
			lsl: -6,
			usl: 6
		});
		const a = assessCapability({
			capability: cap,
			lsl: -6,
			usl: 6,
			openSignals: [],
			violations: [],
			pointsShown: 30,
			observed: null
		});
		expect(a.basis?.index).toBe('Ppk');
		expect(a.verdict).toBe('capable');
	});
	it('no specs: not assessed, with the reason', () => {
		const a = assessCapability({
			capability: null,
			capabilityMessage: 'Set LSL and/or USL to see capability.',
			lsl: null,
			usl: null,
			openSignals: [],
			violations: [],
			pointsShown: 30,
			observed: null
		});
		expect(a).toMatchObject({
			verdict: 'not-assessed',
			detail: 'Set LSL and/or USL to see capability.'
		});
	});
});

describe('helpers', () => {
	it('counts values outside the spec; a value on a limit is inside', () => {
		expect(countOutOfSpec([1, 2, 5, 8, 9], 2, 8)).toEqual({ n: 5, belowLsl: 1, aboveUsl: 1 });
		expect(countOutOfSpec([1, 9], null, 8)).toEqual({ n: 2, belowLsl: 0, aboveUsl: 1 });
	});
	it('names bad thresholds', () => {
		expect(thresholdErrors({ capable: 1.33, marginal: 1, confidenceLevel: 0.95 })).toEqual([]);
		expect(
			thresholdErrors({ capable: 1, marginal: 1.33, confidenceLevel: 2 }).map((e) => e.field)
		).toEqual(['capable', 'confidenceLevel']);
	});
});
