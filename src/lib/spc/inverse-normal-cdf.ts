import { normalCdf } from './normal-distribution';

// P. J. Acklam's rational approximation (relative error < 1.15e-9), coefficients as he
// published them; two Halley steps on the accurate normalCdf then give full double precision.
const A = [
	-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2,
	-3.066479806614716e1, 2.506628277459239
];
const B = [
	-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1,
	-1.328068155288572e1
];
const C = [
	-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734,
	4.374664141464968, 2.938163982698783
];
const D = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
const P_LOW = 0.02425;

function acklam(p: number): number {
	if (p < P_LOW || p > 1 - P_LOW) {
		// Tails: rational function of q = √(−2 ln p), mirrored for the upper tail.
		const q = Math.sqrt(-2 * Math.log(p < P_LOW ? p : 1 - p));
		const x =
			(((((C[0] * q + C[1]) * q + C[2]) * q + C[3]) * q + C[4]) * q + C[5]) /
			((((D[0] * q + D[1]) * q + D[2]) * q + D[3]) * q + 1);
		return p < P_LOW ? x : -x;
	}
	const q = p - 0.5;
	const r = q * q;
	return (
		((((((A[0] * r + A[1]) * r + A[2]) * r + A[3]) * r + A[4]) * r + A[5]) * q) /
		(((((B[0] * r + B[1]) * r + B[2]) * r + B[3]) * r + B[4]) * r + 1)
	);
}

/**
 * Inverse of the standard normal CDF: the z with Φ(z) = p.
 *
 * Used for confidence-interval z values (e.g. 1.959964 for 95 %) and the chi-square start
 * value. Acklam's algorithm (2003, "An algorithm for computing the inverse normal cumulative
 * distribution function") refined by Halley steps on `normalCdf`.
 * @throws RangeError when p is not strictly between 0 and 1.
 * @example inverseNormalCdf(0.975) // 1.959963984540054
 */
export function inverseNormalCdf(p: number): number {
	if (!(p > 0 && p < 1)) throw new RangeError(`inverseNormalCdf: p must be in (0, 1), got ${p}`);
	let x = acklam(p);
	for (let i = 0; i < 2; i++) {
		const e = normalCdf(x) - p;
		const u = e * Math.sqrt(2 * Math.PI) * Math.exp((x * x) / 2);
		x = x - u / (1 + (x * u) / 2);
	}
	return x;
}
