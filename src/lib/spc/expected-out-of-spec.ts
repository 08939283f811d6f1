import { normalCdf } from './normal-distribution';

/** Expected parts per million outside the specification, by side. */
export interface ExpectedOutOfSpec {
	ppmBelowLsl: number | null;
	ppmAboveUsl: number | null;
	ppmTotal: number;
}

/**
 * Expected fraction out of specification (in ppm) for a normal process with the given
 * mean and σ: 1e6·Φ((LSL − μ)/σ) below and 1e6·Φ((μ − USL)/σ) above (tails computed
 * directly, so tiny fractions keep their precision). A missing side gives `null`.
 * Returns `null` when σ is not positive (the normal model is degenerate).
 *
 * Used beside Cpk/Ppk in the capability report. Reference: Montgomery, ISQC §8.3.
 * @example expectedOutOfSpec(0, 1, -3, 3)?.ppmTotal // ≈ 2699.8
 */
export function expectedOutOfSpec(
	mean: number,
	sigma: number,
	lsl: number | null,
	usl: number | null
): ExpectedOutOfSpec | null {
	if (!(sigma > 0) || !Number.isFinite(sigma) || !Number.isFinite(mean)) return null;
	const below = lsl === null ? null : 1e6 * normalCdf((lsl - mean) / sigma);
	const above = usl === null ? null : 1e6 * normalCdf((mean - usl) / sigma);
	return { ppmBelowLsl: below, ppmAboveUsl: above, ppmTotal: (below ?? 0) + (above ?? 0) };
}
