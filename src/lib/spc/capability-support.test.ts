import { describe, it, expect } from 'vitest';
import { capabilityHistogram } from './capability-histogram';
import { cpkConfidenceInterval, cpConfidenceInterval } from './capability-intervals';
import { expectedOutOfSpec } from './expected-out-of-spec';
import { quantile } from './summary-statistics';

describe('expectedOutOfSpec (normal model)', () => {
	it('±3σ specs: 2·Φ(−3) = 2699.796 ppm (A&S 26.1: Φ(−3) = 0.0013498980)', () => {
		const e = expectedOutOfSpec(10, 2, 4, 16);
		expect(e?.ppmBelowLsl).toBeCloseTo(1349.898, 3);
		expect(e?.ppmTotal).toBeCloseTo(2699.796, 3);
	});
	it('±6σ keeps precision in the far tail: 2·Φ(−6)·1e6 ≈ 0.001973 ppm', () => {
		expect(expectedOutOfSpec(0, 1, -6, 6)?.ppmTotal).toBeCloseTo(2 * 9.865876450377e-4, 15);
	});
	it.each([0, -1, NaN, Infinity])('σ = %f gives null', (sigma) => {
		expect(expectedOutOfSpec(0, sigma, -1, 1)).toBeNull();
	});
	it('a missing side is null and does not add to the total', () => {
		const e = expectedOutOfSpec(0, 1, null, 3);
		expect(e?.ppmBelowLsl).toBeNull();
		expect(e?.ppmTotal).toBe(e?.ppmAboveUsl);
	});
});

describe('confidence intervals', () => {
	it('Bissell: half-width z·√(1/(9n) + Cpk²/(2(n−1)))', () => {
		const ci = cpkConfidenceInterval(1.33, 50);
		const half = 1.959963984540054 * Math.sqrt(1 / 450 + 1.33 ** 2 / 98);
		expect(ci.lower).toBeCloseTo(1.33 - half, 12);
		expect(ci.upper).toBeCloseTo(1.33 + half, 12);
	});
	it.each([
		[0, 30],
		[1, 30],
		[0.95, 1],
		[0.95, 2.5]
	])('refuses level %f with n %f', (level, n) => {
		expect(() => cpkConfidenceInterval(1, n, level)).toThrow(RangeError);
		expect(() => cpConfidenceInterval(1, n, level)).toThrow(RangeError);
	});
});

describe('capabilityHistogram', () => {
	const values = Array.from(
		{ length: 200 },
		(_, i) => 100 + 10 * Math.sin(i * 12.9898) * Math.cos(i * 0.37)
	);
	const mean = values.reduce((s, v) => s + v, 0) / values.length;
	const sd = Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1));
	it('Freedman–Diaconis width 2·IQR/n^(1/3); counts sum to n; spec limits inside the range', () => {
		const h = capabilityHistogram(values, { mean, sigmaOverall: sd, lsl: 70, usl: 115 });
		const iqr = quantile(values, 0.75) - quantile(values, 0.25);
		expect(h.method).toBe('freedman-diaconis');
		expect(h.binWidth).toBeCloseTo((2 * iqr) / Math.cbrt(200), 12);
		expect(h.bins.reduce((s, b) => s + b.count, 0)).toBe(200);
		expect(h.bins[0].lower).toBeLessThanOrEqual(70);
		expect(h.bins[h.bins.length - 1].upper).toBeGreaterThanOrEqual(115);
	});
	it('the fitted curve has area n·binWidth, i.e. it is scaled to counts', () => {
		const h = capabilityHistogram(values, {
			mean: 100,
			sigmaOverall: 2,
			lsl: 80,
			usl: 120,
			curvePoints: 401
		});
		const dx = h.curve[1].x - h.curve[0].x;
		const area = h.curve.reduce((s, p) => s + (p.overall ?? 0), 0) * dx;
		expect(area / h.binWidth).toBeCloseTo(200, 1);
		expect(h.curve.every((p) => p.within === null)).toBe(true);
	});
	it('Sturges when the IQR is 0: ⌈log2 n⌉ + 1 bins over the data range', () => {
		const v = [5, 5, 5, 5, 5, 5, 5, 9];
		const h = capabilityHistogram(v, { mean: 5.5, sigmaOverall: 1.4 });
		expect(h.method).toBe('sturges');
		expect(h.bins).toHaveLength(4);
		expect(h.bins[3].count).toBe(1);
	});
	it.each([
		['all equal, no specs', [2, 2, 2], {}, 1],
		['all equal with specs', [2, 2, 2], { lsl: 1, usl: 3 }, 10]
	])('%s gives a usable histogram', (_l, v, specs, bins) => {
		const h = capabilityHistogram(v, { mean: 2, sigmaOverall: 0, ...specs });
		expect(h.bins).toHaveLength(bins);
		expect(h.bins.reduce((s, b) => s + b.count, 0)).toBe(3);
		expect(h.curve.every((p) => p.overall === null)).toBe(true);
	});
	it('far-away spec limits are capped at maxBins', () => {
		const h = capabilityHistogram(values, {
			mean,
			sigmaOverall: sd,
			lsl: -1e6,
			usl: 1e6,
			maxBins: 30
		});
		expect(h.bins).toHaveLength(30);
		expect(h.bins.reduce((s, b) => s + b.count, 0)).toBe(200);
	});
	it('rejects bad values', () => {
		expect(() => capabilityHistogram([], { mean: 0, sigmaOverall: 1 })).toThrow(
			/values: needs at least 1/
		);
		expect(() => capabilityHistogram([1, NaN], { mean: 0, sigmaOverall: 1 })).toThrow(
			/values\[1\]/
		);
	});
});
