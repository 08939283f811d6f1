import { cpConfidenceInterval, cpkConfidenceInterval, type Interval } from './capability-intervals';
import { expectedOutOfSpec, type ExpectedOutOfSpec } from './expected-out-of-spec';
import { SpcInputError } from './spc-input-error';
import { mean as meanOf, sampleStandardDeviation } from './summary-statistics';
import { validateValues } from './validate-input';

/** Input of `processCapability`. */
export interface CapabilityInput {
	/** All individual measurements of the study. */
	values: readonly number[];
	/** Within-subgroup σ̂ from the chart (R̄/d2, s̄/c4 or MR̄/d2(2)); null if unknown. */
	sigmaWithin: number | null;
	lsl?: number | null;
	usl?: number | null;
	/** Nominal value; enables Cpm. */
	target?: number | null;
	/** Process centre; defaults to the mean of `values` (x̿ for equal subgroups). */
	mean?: number;
	/** Two-sided confidence level of the intervals; default 0.95. */
	confidenceLevel?: number;
}

/** Capability (within σ̂) and performance (overall s) indices; undefined ones are null. */
export interface CapabilityResult {
	n: number;
	mean: number;
	sigmaWithin: number | null;
	sigmaOverall: number;
	cp: number | null;
	cpk: number | null;
	cpu: number | null;
	cpl: number | null;
	pp: number | null;
	ppk: number | null;
	ppu: number | null;
	ppl: number | null;
	/** Taguchi index (USL − LSL)/(6√(s² + (μ − T)²)); needs both specs and a target. */
	cpm: number | null;
	confidenceLevel: number;
	cpInterval: Interval | null;
	cpkInterval: Interval | null;
	ppInterval: Interval | null;
	ppkInterval: Interval | null;
	/** Expected ppm out of spec, normal model with within σ̂ / with overall s. */
	expectedWithin: ExpectedOutOfSpec | null;
	expectedOverall: ExpectedOutOfSpec | null;
	/** Why an index is null, in plain words. */
	notes: string[];
}

function finiteOrNull(x: number): number | null {
	return Number.isFinite(x) ? x : null;
}

interface Indices {
	p: number | null;
	pk: number | null;
	upper: number | null;
	lower: number | null;
}

function indices(
	mu: number,
	sigma: number | null,
	lsl: number | null,
	usl: number | null
): Indices {
	if (sigma === null || !(sigma > 0)) return { p: null, pk: null, upper: null, lower: null };
	const upper = usl === null ? null : finiteOrNull((usl - mu) / (3 * sigma));
	const lower = lsl === null ? null : finiteOrNull((mu - lsl) / (3 * sigma));
	const p = usl === null || lsl === null ? null : finiteOrNull((usl - lsl) / (6 * sigma));
	const sides = [upper, lower].filter((v): v is number => v !== null);
	return { p, pk: sides.length ? Math.min(...sides) : null, upper, lower };
}

function optionalSpec(v: number | null | undefined, field: string): number | null {
	if (v === undefined || v === null) return null;
	if (typeof v !== 'number' || !Number.isFinite(v)) {
		throw new SpcInputError(field, `is ${String(v)}, expected a finite number`);
	}
	return v;
}

/**
 * Process capability and performance against specification limits.
 *
 * Cp = (USL − LSL)/6σ̂, Cpk = min(Cpu, Cpl) with Cpu = (USL − μ)/3σ̂, Cpl = (μ − LSL)/3σ̂,
 * σ̂ = within σ from the control chart; Pp/Ppk the same with the overall sample standard
 * deviation s (ddof 1) of all values (AIAG SPC manual convention; NIST e-Handbook §6.1.6 for
 * the formulas). One-sided specs: Cp and Pp are null, Cpk/Ppk come from the given side.
 * Zero variation or missing specs give null indices with a note (never NaN or Infinity).
 * Intervals: Bissell (1990) for Cpk/Ppk, chi-square for Cp/Pp, n = number of values. No verdict
 * here: `assessCapability` judges stability first, then the lower confidence bound.
 * @throws SpcInputError for non-finite values, fewer than 2 values, or LSL ≥ USL.
 * @example processCapability({ values, sigmaWithin: 1.6, lsl: 90, usl: 100 }).cpk
 */
export function processCapability(input: CapabilityInput): CapabilityResult {
	const values = validateValues(input.values, 'values', 2);
	return capabilityFromSummary({
		n: values.length,
		mean: input.mean ?? meanOf(values),
		sigmaOverall: sampleStandardDeviation(values),
		sigmaWithin: input.sigmaWithin,
		lsl: input.lsl,
		usl: input.usl,
		target: input.target,
		confidenceLevel: input.confidenceLevel
	});
}

/** The summary figures capability needs, when the individual values are not at hand. */
export interface CapabilitySummaryInput extends Omit<CapabilityInput, 'values' | 'mean'> {
	/** Number of individual values (at least 2). */
	n: number;
	/** Process centre. */
	mean: number;
	/** Overall sample standard deviation of all n values (ddof 1). */
	sigmaOverall: number;
}

/**
 * Capability from summary figures: the same indices and intervals as
 * `processCapability`, for callers that keep only counts, means and standard deviations (e.g.
 * per-board SPI aggregates pooled exactly).
 * @throws {SpcInputError} for n < 2, a non-finite mean or sigma, or LSL ≥ USL.
 * @example capabilityFromSummary({ n: 30, mean: 97, sigmaOverall: 1.6, sigmaWithin: 1.6, lsl: 90, usl: 100 }).cpk // 0.625
 */
export function capabilityFromSummary(input: CapabilitySummaryInput): CapabilityResult {
	if (!Number.isInteger(input.n) || input.n < 2) {
		throw new SpcInputError('values', `needs at least 2 values, got ${input.n}`);
	}
	if (
		!Number.isFinite(input.mean) ||
		!Number.isFinite(input.sigmaOverall) ||
		input.sigmaOverall < 0
	) {
		throw new SpcInputError('values', 'mean and overall sigma must be finite numbers');
	}
	const lsl = optionalSpec(input.lsl, 'lsl');
	const usl = optionalSpec(input.usl, 'usl');
	const target = optionalSpec(input.target, 'target');
	if (lsl !== null && usl !== null && lsl >= usl) {
		throw new SpcInputError('lsl', `LSL ${lsl} must be below USL ${usl}`);
	}
	const level = input.confidenceLevel ?? 0.95;
	const n = input.n;
	const mu = input.mean;
	const sigmaOverall = input.sigmaOverall;
	const sigmaWithin =
		input.sigmaWithin === null || !Number.isFinite(input.sigmaWithin) ? null : input.sigmaWithin;
	const notes: string[] = [];
	if (lsl === null && usl === null) {
		notes.push('No specification limits given: capability indices need LSL and/or USL.');
	} else if (lsl === null || usl === null) {
		notes.push('One-sided specification: Cp and Pp are undefined; Cpk and Ppk use the given side.');
	}
	if (sigmaWithin === null) {
		notes.push('Within-subgroup sigma unknown: Cp and Cpk not computed.');
	} else if (sigmaWithin <= 0) {
		notes.push('Zero within-subgroup variation: Cp and Cpk undefined (check gauge resolution).');
	}
	if (sigmaOverall <= 0) {
		notes.push('Zero overall variation (all values equal): Pp and Ppk are undefined.');
	}

	const within = indices(mu, sigmaWithin, lsl, usl);
	const overall = indices(mu, sigmaOverall, lsl, usl);
	let cpm: number | null = null;
	if (target !== null && lsl !== null && usl !== null) {
		const tau = Math.sqrt(sigmaOverall ** 2 + (mu - target) ** 2);
		cpm = tau > 0 ? finiteOrNull((usl - lsl) / (6 * tau)) : null;
	}
	const ci = (v: number | null, f: typeof cpkConfidenceInterval) =>
		v === null ? null : f(v, n, level);
	return {
		n,
		mean: mu,
		sigmaWithin,
		sigmaOverall,
		cp: within.p,
		cpk: within.pk,
		cpu: within.upper,
		cpl: within.lower,
		pp: overall.p,
		ppk: overall.pk,
		ppu: overall.upper,
		ppl: overall.lower,
		cpm,
		confidenceLevel: level,
		cpInterval: ci(within.p, cpConfidenceInterval),
		cpkInterval: ci(within.pk, cpkConfidenceInterval),
		ppInterval: ci(overall.p, cpConfidenceInterval),
		ppkInterval: ci(overall.pk, cpkConfidenceInterval),
		expectedWithin:
			lsl === null && usl === null ? null : expectedOutOfSpec(mu, sigmaWithin ?? 0, lsl, usl),
		expectedOverall:
			lsl === null && usl === null ? null : expectedOutOfSpec(mu, sigmaOverall, lsl, usl),
		notes
	};
}
