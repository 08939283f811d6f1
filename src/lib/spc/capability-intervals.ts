import { chiSquareQuantile } from './chi-square-quantile';
import { inverseNormalCdf } from './inverse-normal-cdf';

/** A two-sided confidence interval. */
export interface Interval {
	lower: number;
	upper: number;
}

function checkLevel(confidenceLevel: number, sampleSize: number, fn: string): void {
	if (!(confidenceLevel > 0 && confidenceLevel < 1)) {
		throw new RangeError(`${fn}: confidence level must be in (0, 1), got ${confidenceLevel}`);
	}
	if (!Number.isInteger(sampleSize) || sampleSize < 2) {
		throw new RangeError(`${fn}: sample size must be an integer ≥ 2, got ${sampleSize}`);
	}
}

/**
 * Approximate two-sided confidence interval for Cpk (or Ppk):
 * Ĉpk ± z·√(1/(9n) + Ĉpk²/(2(n−1))), n = number of individual values.
 *
 * Reference: Bissell, A.F. (1990), "How reliable is your capability index?", Applied
 * Statistics 39(3); printed with 1.96 in Rodriguez (1992), J. Quality Technology 24(4).
 * Derived for σ̂ = s; with σ̂ = R̄/d2 it is the usual approximation.
 * @throws RangeError for a level outside (0, 1) or n < 2.
 * @example cpkConfidenceInterval(0.625, 30) // { lower: ≈0.425, upper: ≈0.825 }
 */
export function cpkConfidenceInterval(
	cpk: number,
	sampleSize: number,
	confidenceLevel = 0.95
): Interval {
	checkLevel(confidenceLevel, sampleSize, 'cpkConfidenceInterval');
	const z = inverseNormalCdf(1 - (1 - confidenceLevel) / 2);
	const half = z * Math.sqrt(1 / (9 * sampleSize) + (cpk * cpk) / (2 * (sampleSize - 1)));
	return { lower: cpk - half, upper: cpk + half };
}

/**
 * Exact (normal-theory) two-sided confidence interval for Cp (or Pp) from the chi-square
 * distribution with n − 1 degrees of freedom:
 * Ĉp·√(χ²_{α/2}/(n−1)) ≤ Cp ≤ Ĉp·√(χ²_{1−α/2}/(n−1)), χ²_p the lower p-quantile.
 * Reference: Montgomery, Introduction to Statistical Quality Control, §8.3 (from memory).
 * @throws RangeError for a level outside (0, 1) or n < 2.
 * @example cpConfidenceInterval(1, 30).lower // √(16.047/29) ≈ 0.7439
 */
export function cpConfidenceInterval(
	cp: number,
	sampleSize: number,
	confidenceLevel = 0.95
): Interval {
	checkLevel(confidenceLevel, sampleSize, 'cpConfidenceInterval');
	const alpha = 1 - confidenceLevel;
	const df = sampleSize - 1;
	return {
		lower: cp * Math.sqrt(chiSquareQuantile(alpha / 2, df) / df),
		upper: cp * Math.sqrt(chiSquareQuantile(1 - alpha / 2, df) / df)
	};
}
