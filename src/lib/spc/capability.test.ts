import { describe, it, expect } from 'vitest';
import ref from '../../../reference/spc/worked-examples.json';
import { capabilityFromSummary, processCapability } from './capability';
import { chiSquareQuantile } from './chi-square-quantile';

const w = ref.cpkConfidenceIntervalCheck;

/** n values with exactly the given mean and sample sd (ddof 1). */
function valuesWith(n: number, mean: number, sd: number): number[] {
	const raw = Array.from({ length: n }, (_, i) => Math.sin(i * 1.7) + (i % 3));
	const m = raw.reduce((s, v) => s + v, 0) / n;
	const s = Math.sqrt(raw.reduce((acc, v) => acc + (v - m) ** 2, 0) / (n - 1));
	return raw.map((v) => mean + (sd * (v - m)) / s);
}

function hasNoNaNOrInfinity(x: unknown): boolean {
	if (typeof x === 'number') return Number.isFinite(x);
	if (Array.isArray(x)) return x.every(hasNoNaNOrInfinity);
	if (x && typeof x === 'object') return Object.values(x).every(hasNoNaNOrInfinity);
	return true;
}

describe('worked check (REFERENCE-FACTS b): USL 100, LSL 90, n 30, x̄ 97, s 1.6', () => {
	const values = valuesWith(w.n, w.mean, w.s);
	const cap = processCapability({ values, sigmaWithin: w.s, lsl: w.lsl, usl: w.usl });
	it('Cpk = 0.625 and its 95 % Bissell interval is [0.425, 0.825]', () => {
		expect(cap.cpk).toBeCloseTo(w.cpk, 12);
		expect(cap.cpkInterval?.lower).toBeCloseTo(w.ci95[0], w.decimals);
		expect(cap.cpkInterval?.upper).toBeCloseTo(w.ci95[1], w.decimals);
	});
	it('overall s equals the within σ here, so Pp/Ppk equal Cp/Cpk', () => {
		expect(cap.sigmaOverall).toBeCloseTo(w.s, 12);
		expect(cap.ppk).toBeCloseTo(w.cpk, 12);
		expect(cap.pp).toBeCloseTo(cap.cp as number, 12);
	});
	it('Cp = 10/(6·1.6), Cpu = 3/4.8, Cpl = 7/4.8, and the chi-square CI uses χ²(0.025/0.975, 29)', () => {
		expect(cap.cp).toBeCloseTo(10 / 9.6, 12);
		expect(cap.cpu).toBeCloseTo(0.625, 12);
		expect(cap.cpl).toBeCloseTo(7 / 4.8, 12);
		// printed table values χ²(0.025, 29) = 16.047 and χ²(0.975, 29) = 45.722
		expect(cap.cpInterval?.lower).toBeCloseTo((10 / 9.6) * Math.sqrt(16.047 / 29), 4);
		expect(cap.cpInterval?.upper).toBeCloseTo((10 / 9.6) * Math.sqrt(45.722 / 29), 4);
	});
	it('a 90 % level gives a narrower interval (z = 1.645)', () => {
		const c90 = processCapability({
			values,
			sigmaWithin: w.s,
			lsl: w.lsl,
			usl: w.usl,
			confidenceLevel: 0.9
		});
		const half = 1.6448536269514722 * Math.sqrt(1 / 270 + 0.625 ** 2 / 58);
		expect(c90.cpkInterval?.upper).toBeCloseTo(0.625 + half, 12);
		expect(c90.cpInterval?.lower).toBeCloseTo(
			(10 / 9.6) * Math.sqrt(chiSquareQuantile(0.05, 29) / 29),
			12
		);
	});
	it('gives expected ppm per side (normal model)', () => {
		// above USL: z = 3/1.6 = 1.875 → 1 − Φ(1.875) ≈ 0.0304 (A&S 26.1)
		expect(cap.expectedWithin?.ppmAboveUsl).toBeGreaterThan(30000);
		expect(cap.expectedWithin?.ppmAboveUsl).toBeLessThan(30800);
	});
});

describe('specification cases', () => {
	const values = valuesWith(25, 50, 2);
	it('upper spec only: Cp and Pp null, Cpk = Cpu, a note says why', () => {
		const cap = processCapability({ values, sigmaWithin: 2, usl: 62 });
		expect(cap.cp).toBeNull();
		expect(cap.pp).toBeNull();
		expect(cap.cpl).toBeNull();
		expect(cap.cpk).toBeCloseTo(12 / 6, 12);
		expect(cap.expectedWithin?.ppmBelowLsl).toBeNull();
		expect(cap.notes.join(' ')).toMatch(/One-sided/);
	});
	it('lower spec only: Cpk = Cpl', () => {
		const cap = processCapability({ values, sigmaWithin: 2, lsl: 44 });
		expect(cap.cpk).toBeCloseTo(1, 12);
	});
	it('no specs: all indices null with a note, no NaN', () => {
		const cap = processCapability({ values, sigmaWithin: 2 });
		expect([cap.cp, cap.cpk, cap.pp, cap.ppk, cap.expectedWithin]).toEqual([
			null,
			null,
			null,
			null,
			null
		]);
		expect(hasNoNaNOrInfinity(cap)).toBe(true);
	});
	it('mean outside the spec gives a negative Cpk (a number, not an error)', () => {
		const cap = processCapability({ values, sigmaWithin: 2, lsl: 55, usl: 70 });
		expect(cap.cpk).toBeCloseTo((50 - 55) / 6, 12);
	});
	it('Cpm equals Pp when the target is the mean, and is lower off target', () => {
		const on = processCapability({ values, sigmaWithin: 2, lsl: 40, usl: 60, target: 50 });
		expect(on.cpm).toBeCloseTo(on.pp as number, 10);
		const off = processCapability({ values, sigmaWithin: 2, lsl: 40, usl: 60, target: 52 });
		expect(off.cpm).toBeCloseTo(20 / (6 * Math.sqrt(4 + 4)), 10);
	});
	it('LSL ≥ USL is refused', () => {
		expect(() => processCapability({ values, sigmaWithin: 2, lsl: 5, usl: 5 })).toThrow(
			/lsl: LSL 5 must be below USL 5/
		);
	});
});

describe('zero variation and edge sizes', () => {
	it.each([
		['all equal, σ within 0', [3, 3, 3, 3], 0],
		['all equal, σ within unknown', [3, 3], null]
	])('%s → indices null with reasons, never NaN/Infinity', (_l, values, sigmaWithin) => {
		const cap = processCapability({ values, sigmaWithin, lsl: 1, usl: 5, target: 3 });
		expect([cap.cp, cap.cpk, cap.pp, cap.ppk, cap.cpm]).toEqual([null, null, null, null, null]);
		expect(cap.cpkInterval).toBeNull();
		expect(cap.notes.join(' ')).toMatch(/Zero overall variation/);
		expect(hasNoNaNOrInfinity(cap)).toBe(true);
	});
	it('n = 2 is the minimum; n = 1 and NaN are refused', () => {
		expect(processCapability({ values: [1, 2], sigmaWithin: 0.5, lsl: 0, usl: 3 }).cpk).toBeCloseTo(
			1,
			12
		);
		expect(() => processCapability({ values: [1], sigmaWithin: 1 })).toThrow(
			/values: needs at least 2/
		);
		expect(() => processCapability({ values: [1, NaN], sigmaWithin: 1 })).toThrow(
			/values\[1\]: is NaN/
		);
	});
});

describe('capabilityFromSummary', () => {
	it('gives the worked Cpk from summary figures (USL 100, LSL 90, n 30, x̄ 97, s 1.6 → 0.625)', () => {
		// REFERENCE-FACTS b, worked check computed by hand: Cpk = (100 − 97)/(3 · 1.6) = 0.625.
		const result = capabilityFromSummary({
			n: 30,
			mean: 97,
			sigmaOverall: 1.6,
			sigmaWithin: 1.6,
			lsl: 90,
			usl: 100
		});
		expect(result.cpk).toBeCloseTo(0.625, 12);
		expect(result.cpkInterval!.lower).toBeCloseTo(0.425, 3);
		expect(result.cpkInterval!.upper).toBeCloseTo(0.825, 3);
	});

	it('equals processCapability on the same values', () => {
		const values = [102.0, 94.8, 98.3, 98.4, 102.0, 98.5, 99.0, 97.7, 100.0, 98.1];
		const fromValues = processCapability({
			values,
			sigmaWithin: 2.1,
			lsl: 90,
			usl: 110,
			target: 100
		});
		const fromSummary = capabilityFromSummary({
			n: values.length,
			mean: fromValues.mean,
			sigmaOverall: fromValues.sigmaOverall,
			sigmaWithin: 2.1,
			lsl: 90,
			usl: 110,
			target: 100
		});
		expect(fromSummary).toEqual(fromValues);
	});

	it.each([
		[{ n: 1, mean: 1, sigmaOverall: 1 }, 'values'],
		[{ n: 10, mean: Number.NaN, sigmaOverall: 1 }, 'values'],
		[{ n: 10, mean: 1, sigmaOverall: 1, lsl: 5, usl: 4 }, 'lsl']
	])('refuses %j naming %s', (input, field) => {
		expect(() => capabilityFromSummary({ sigmaWithin: null, ...input })).toThrow(
			expect.objectContaining({ field })
		);
	});
});
