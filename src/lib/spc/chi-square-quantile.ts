import { logGamma, regularizedGammaP } from './gamma-functions';
import { inverseNormalCdf } from './inverse-normal-cdf';

/**
 * Chi-square CDF with ν degrees of freedom: P(ν/2, x/2).
 * @throws RangeError for ν ≤ 0.
 * @example chiSquareCdf(3.841458820694124, 1) // 0.95
 */
export function chiSquareCdf(x: number, degreesOfFreedom: number): number {
	if (!(degreesOfFreedom > 0)) {
		throw new RangeError(`chiSquareCdf: degrees of freedom must be > 0, got ${degreesOfFreedom}`);
	}
	return x <= 0 ? 0 : regularizedGammaP(degreesOfFreedom / 2, x / 2);
}

/**
 * Lower p-quantile of the chi-square distribution: the x with P(χ²_ν ≤ x) = p.
 *
 * Used for the confidence interval of Cp/Pp (Montgomery, ISQC §8.3). Start from the
 * Wilson–Hilferty cube approximation (1931), then Newton steps on the regularized gamma
 * function, with bisection as a safeguard, to ~1e-12 relative.
 * @throws RangeError when p is not in (0, 1) or ν ≤ 0.
 * @example chiSquareQuantile(0.95, 2) // −2·ln(0.05) = 5.991464547107979
 */
export function chiSquareQuantile(p: number, degreesOfFreedom: number): number {
	const nu = degreesOfFreedom;
	if (!(p > 0 && p < 1)) throw new RangeError(`chiSquareQuantile: p must be in (0, 1), got ${p}`);
	if (!(nu > 0)) {
		throw new RangeError(`chiSquareQuantile: degrees of freedom must be > 0, got ${nu}`);
	}
	const z = inverseNormalCdf(p);
	const k = 2 / (9 * nu);
	let x = nu * Math.pow(Math.max(1 - k + z * Math.sqrt(k), 0.01), 3);
	let lo = 0;
	let hi = Infinity;
	const a = nu / 2;
	const logNorm = logGamma(a) + a * Math.log(2);
	for (let i = 0; i < 100; i++) {
		const f = chiSquareCdf(x, nu) - p;
		if (f > 0) hi = Math.min(hi, x);
		else lo = Math.max(lo, x);
		const density = Math.exp((a - 1) * Math.log(x) - x / 2 - logNorm);
		let next = density > 0 ? x - f / density : NaN;
		// Keep the iterate inside the bracket; fall back to bisection when Newton jumps out.
		if (!(next > lo && next < hi)) next = hi === Infinity ? Math.max(2 * x, lo + 1) : (lo + hi) / 2;
		if (Math.abs(next - x) <= 1e-13 * x) return next;
		x = next;
	}
	return x;
}
