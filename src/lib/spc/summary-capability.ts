import { capabilityFromSummary, type CapabilityResult } from './capability';
import { SpcInputError } from './spc-input-error';

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

/**
 * Capability from pooled summaries when the values themselves are not read (per-board SPI
 * aggregates): `capabilityFromSummary` (the formulas of `processCapability`) with the overall s
 * from `pooledStats`. Tested against `processCapability` on the raw values.
 * @throws SpcInputError for fewer than 2 values or LSL ≥ USL.
 */
export function summaryCapability(input: {
	groups: readonly SubgroupStats[];
	sigmaWithin: number | null;
	lsl: number | null;
	usl: number | null;
	target: number | null;
}): CapabilityResult {
	const pooled = pooledStats(input.groups);
	return capabilityFromSummary({
		n: pooled.n,
		mean: pooled.mean,
		sigmaOverall: pooled.sd,
		sigmaWithin: input.sigmaWithin,
		lsl: input.lsl,
		usl: input.usl,
		target: input.target
	});
}
