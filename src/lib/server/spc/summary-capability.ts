import {
	capabilityReading,
	cpConfidenceInterval,
	cpkConfidenceInterval,
	expectedOutOfSpec,
	SpcInputError,
	type CapabilityResult
} from '$lib/spc';

/** Count, mean and sample standard deviation of one subgroup (e.g. one board's pads). */
export interface SubgroupStats {
	n: number;
	mean: number;
	sd: number;
}

/**
 * Pool subgroup summaries into the overall count, mean and sample standard deviation of all
 * values, exactly: SS = Σ[(nᵢ − 1)sᵢ² + nᵢ(x̄ᵢ − x̿)²], s = √(SS/(N − 1)) (the usual
 * decomposition of the total sum of squares).
 * @example pooledStats([{ n: 2, mean: 1, sd: 0 }, { n: 2, mean: 3, sd: 0 }]) // { n: 4, mean: 2, sd: 1.1547 }
 */
export function pooledStats(groups: readonly SubgroupStats[]): SubgroupStats {
	const n = groups.reduce((a, g) => a + g.n, 0);
	if (n < 2) throw new SpcInputError('values', `needs at least 2 values, got ${n}`);
	const mean = groups.reduce((a, g) => a + g.n * g.mean, 0) / n;
	const ss = groups.reduce((a, g) => a + (g.n - 1) * g.sd * g.sd + g.n * (g.mean - mean) ** 2, 0);
	return { n, mean, sd: Math.sqrt(Math.max(0, ss) / (n - 1)) };
}

function finite(v: number): number | null {
	return Number.isFinite(v) ? v : null;
}

function sideIndices(mu: number, sigma: number | null, lsl: number | null, usl: number | null) {
	if (sigma === null || !(sigma > 0)) return { p: null, pk: null, upper: null, lower: null };
	const upper = usl === null ? null : finite((usl - mu) / (3 * sigma));
	const lower = lsl === null ? null : finite((mu - lsl) / (3 * sigma));
	const p = usl === null || lsl === null ? null : finite((usl - lsl) / (6 * sigma));
	const sides = [upper, lower].filter((v): v is number => v !== null);
	return { p, pk: sides.length ? Math.min(...sides) : null, upper, lower };
}

/**
 * Capability from pooled summaries when the values themselves are not read (per-board SPI
 * aggregates): the same formulas and intervals as `processCapability` (NIST e-Handbook §6.1.6,
 * Bissell 1990), with the overall s from `pooledStats`. Tested against `processCapability` on
 * the raw values.
 * @throws SpcInputError for fewer than 2 values or LSL ≥ USL.
 */
export function summaryCapability(input: {
	groups: readonly SubgroupStats[];
	sigmaWithin: number | null;
	lsl: number | null;
	usl: number | null;
	target: number | null;
}): CapabilityResult {
	const { lsl, usl, target } = input;
	if (lsl !== null && usl !== null && lsl >= usl) {
		throw new SpcInputError('lsl', `LSL ${lsl} must be below USL ${usl}`);
	}
	const pooled = pooledStats(input.groups);
	const mu = pooled.mean;
	const sigmaOverall = pooled.sd;
	const sigmaWithin = input.sigmaWithin !== null && Number.isFinite(input.sigmaWithin) ? input.sigmaWithin : null;
	const notes: string[] = [];
	if (lsl === null || usl === null) {
		notes.push('One-sided specification: Cp and Pp are undefined; Cpk and Ppk use the given side.');
	}
	const within = sideIndices(mu, sigmaWithin, lsl, usl);
	const overall = sideIndices(mu, sigmaOverall, lsl, usl);
	let cpm: number | null = null;
	if (target !== null && lsl !== null && usl !== null) {
		const tau = Math.sqrt(sigmaOverall ** 2 + (mu - target) ** 2);
		cpm = tau > 0 ? finite((usl - lsl) / (6 * tau)) : null;
	}
	const n = pooled.n;
	const ci = (v: number | null, f: typeof cpkConfidenceInterval) => (v === null ? null : f(v, n, 0.95));
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
		confidenceLevel: 0.95,
		cpInterval: ci(within.p, cpConfidenceInterval),
		cpkInterval: ci(within.pk, cpkConfidenceInterval),
		ppInterval: ci(overall.p, cpConfidenceInterval),
		ppkInterval: ci(overall.pk, cpkConfidenceInterval),
		expectedWithin: lsl === null && usl === null ? null : expectedOutOfSpec(mu, sigmaWithin ?? 0, lsl, usl),
		expectedOverall: lsl === null && usl === null ? null : expectedOutOfSpec(mu, sigmaOverall, lsl, usl),
		reading: within.pk === null ? capabilityReading(overall.pk, 'Ppk') : capabilityReading(within.pk, 'Cpk'),
		notes
	};
}
