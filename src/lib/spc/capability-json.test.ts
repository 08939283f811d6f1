import { describe, it, expect } from 'vitest';
import ref from '../../../reference/spc/worked-examples.json';
import { capabilityFromSummary } from './capability';
import { assessCapability } from './capability-assessment';
import { capabilityJson } from './capability-json';

const w = ref.cpkConfidenceIntervalCheck;

describe('capabilityJson', () => {
	it('flattens indices, 95 % intervals and expected ppm (Bissell worked check)', () => {
		const cap = capabilityFromSummary({
			n: w.n,
			mean: w.mean,
			sigmaOverall: w.s,
			sigmaWithin: w.s,
			lsl: w.lsl,
			usl: w.usl
		});
		const assessment = assessCapability({
			capability: cap,
			lsl: w.lsl,
			usl: w.usl,
			openSignals: [],
			violations: [],
			pointsShown: 30,
			observed: { n: 30, belowLsl: 0, aboveUsl: 1 }
		});
		const json = capabilityJson(cap, assessment);
		expect(json.cpk).toBeCloseTo(w.cpk, w.decimals);
		expect(json.cpkLower95).toBeCloseTo(w.ci95[0], w.decimals);
		expect(json.cpkUpper95).toBeCloseTo(w.ci95[1], w.decimals);
		// Cp = (USL − LSL)/6σ = 10/9.6; Pp equals it because σ within = s here
		expect(json.cp).toBeCloseTo(10 / 9.6, 12);
		expect(json.pp).toBeCloseTo(10 / 9.6, 12);
		expect(json.ppmTotal).toBe(cap.expectedWithin?.ppmTotal);
		expect(json.reading).toBe(`${assessment.headline}. ${assessment.detail}`);
		expect(json.level).toBe('not-capable');
		expect(json.cpkLowerBound).toBe(assessment.basis?.lowerBound);
		expect(json.ppmObserved).toBeCloseTo(1e6 / 30, 6);
		expect(json.expectedFrom).toBe('within');
		expect(JSON.parse(JSON.stringify(json))).toEqual(json);
	});

	it('one-sided spec: Cp, Pp and the Cp interval are null, not NaN', () => {
		const cap = capabilityFromSummary({
			n: 30,
			mean: 97,
			sigmaOverall: 1.6,
			sigmaWithin: 1.6,
			usl: 100
		});
		const json = capabilityJson(
			cap,
			assessCapability({
				capability: cap,
				lsl: null,
				usl: 100,
				openSignals: [],
				violations: [],
				pointsShown: 30,
				observed: null
			})
		);
		expect(json.cp).toBeNull();
		expect(json.pp).toBeNull();
		expect(json.cpLower95).toBeNull();
		expect(json.cpl).toBeNull();
		// Cpk = (USL − μ)/3σ = 3/4.8 from the given side
		expect(json.cpk).toBeCloseTo(3 / 4.8, 12);
		expect(json.ppmBelowLsl).toBeNull();
		expect(json.ppmTotal).toBe(json.ppmAboveUsl);
		expect(json.notes.join(' ')).toMatch(/One-sided/);
	});
});
