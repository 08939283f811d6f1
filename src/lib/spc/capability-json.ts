import type { CapabilityResult } from './capability';
import type { CapabilityLevel } from './capability-reading';

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
	/** Plain-language reading against 1.33 and 1.67. */
	reading: string;
	level: CapabilityLevel;
	notes: string[];
}

/**
 * The one mapping of a capability result to its JSON shape, shared by every API answer.
 * @example capabilityJson(processCapability({ values, sigmaWithin: 1.2, lsl: 8, usl: 16 })).cpk
 */
export function capabilityJson(cap: CapabilityResult): CapabilityJson {
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
		reading: cap.reading.text,
		level: cap.reading.level,
		notes: cap.notes
	};
}
