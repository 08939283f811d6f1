import type { CapabilityResult } from './capability';
import type { CapabilityAssessment, CapabilityVerdict } from './capability-assessment';

/**
 * Capability as the JSON APIs return it (`POST /api/spc/analyze`, `GET /api/charts/{id}`):
 * flat, numbers unrounded, undefined indices and intervals `null` (never NaN or Infinity).
 */
export interface CapabilityJson {
	cp: number | null;
	cpk: number | null;
	pp: number | null;
	ppk: number | null;
	sigmaWithin: number | null;
	sigmaOverall: number;
	mean: number;
	n: number;
	cpu: number | null;
	cpl: number | null;
	ppu: number | null;
	ppl: number | null;
	cpm: number | null;
	cpLower95: number | null;
	cpUpper95: number | null;
	cpkLower95: number | null;
	cpkUpper95: number | null;
	ppkLower95: number | null;
	ppkUpper95: number | null;
	ppmBelowLsl: number | null;
	ppmAboveUsl: number | null;
	/** Expected total ppm out of spec with within σ̂ (normal model). */
	ppmTotal: number | null;
	/** Expected total ppm out of spec with overall s. */
	ppmTotalOverall: number | null;
	/** One-sided lower confidence bounds (level of the assessment, default 95 %). */
	cpLowerBound: number | null;
	cpkLowerBound: number | null;
	ppLowerBound: number | null;
	ppkLowerBound: number | null;
	/** Observed out-of-spec ppm of the shown data (null when the values are not at hand). */
	ppmObserved: number | null;
	/** Expected out-of-spec ppm the assessment shows, and which spread it comes from. */
	ppmExpected: number | null;
	expectedFrom: 'within' | 'overall' | null;
	/** The assessment's headline and why (stability first, then the lower bound). */
	reading: string;
	level: CapabilityVerdict;
	notes: string[];
}

/**
 * The one mapping of a capability result and its assessment to the JSON shape, shared by every
 * API answer (`level` and `reading` are the assessment's verdict and words).
 * @example capabilityJson(cap, assessCapability({ capability: cap, … })).level
 */
export function capabilityJson(
	cap: CapabilityResult,
	assessment: CapabilityAssessment
): CapabilityJson {
	return {
		cp: cap.cp,
		cpk: cap.cpk,
		pp: cap.pp,
		ppk: cap.ppk,
		sigmaWithin: cap.sigmaWithin,
		sigmaOverall: cap.sigmaOverall,
		mean: cap.mean,
		n: cap.n,
		cpu: cap.cpu,
		cpl: cap.cpl,
		ppu: cap.ppu,
		ppl: cap.ppl,
		cpm: cap.cpm,
		cpLower95: cap.cpInterval?.lower ?? null,
		cpUpper95: cap.cpInterval?.upper ?? null,
		cpkLower95: cap.cpkInterval?.lower ?? null,
		cpkUpper95: cap.cpkInterval?.upper ?? null,
		ppkLower95: cap.ppkInterval?.lower ?? null,
		ppkUpper95: cap.ppkInterval?.upper ?? null,
		ppmBelowLsl: cap.expectedWithin?.ppmBelowLsl ?? null,
		ppmAboveUsl: cap.expectedWithin?.ppmAboveUsl ?? null,
		ppmTotal: cap.expectedWithin?.ppmTotal ?? null,
		ppmTotalOverall: cap.expectedOverall?.ppmTotal ?? null,
		cpLowerBound: assessment.indices?.cp.lowerBound ?? null,
		cpkLowerBound: assessment.indices?.cpk.lowerBound ?? null,
		ppLowerBound: assessment.indices?.pp.lowerBound ?? null,
		ppkLowerBound: assessment.indices?.ppk.lowerBound ?? null,
		ppmObserved: assessment.observed?.total ?? null,
		ppmExpected: assessment.expected?.total ?? null,
		expectedFrom: assessment.expected?.spread ?? null,
		reading: `${assessment.headline}. ${assessment.detail}`,
		level: assessment.verdict,
		notes: cap.notes
	};
}
