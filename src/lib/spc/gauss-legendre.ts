/**
 * Nodes and weights of m-point Gauss–Legendre quadrature on [−1, 1], computed by Newton's
 * method on the Legendre polynomial (three-term recurrence); exact for polynomials of
 * degree ≤ 2m − 1. Reference: Abramowitz & Stegun 25.4.29; Golub & Welsch (1969).
 *
 * Used by the chart-constant integrals, where the integrand has a kink at the interval end
 * and the plain trapezoidal rule would only be second-order accurate.
 * @throws RangeError when m is not an integer ≥ 1.
 * @example gaussLegendre(2).nodes // [−1/√3, 1/√3]
 */
export function gaussLegendre(m: number): { nodes: number[]; weights: number[] } {
	if (!Number.isInteger(m) || m < 1) {
		throw new RangeError(`gaussLegendre: m must be an integer ≥ 1, got ${m}`);
	}
	const nodes = new Array<number>(m);
	const weights = new Array<number>(m);
	for (let i = 0; i < Math.ceil(m / 2); i++) {
		// Tricomi's initial guess for the i-th root, then Newton.
		let x = Math.cos((Math.PI * (i + 0.75)) / (m + 0.5));
		let dp = 1;
		for (let iter = 0; iter < 100; iter++) {
			let p0 = 1;
			let p1 = x;
			for (let k = 2; k <= m; k++) {
				const p2 = ((2 * k - 1) * x * p1 - (k - 1) * p0) / k;
				p0 = p1;
				p1 = p2;
			}
			dp = (m * (x * p1 - p0)) / (x * x - 1);
			const dx = p1 / dp;
			x -= dx;
			if (Math.abs(dx) < 1e-16) break;
		}
		const w = 2 / ((1 - x * x) * dp * dp);
		nodes[i] = -x;
		nodes[m - 1 - i] = x;
		weights[i] = w;
		weights[m - 1 - i] = w;
	}
	return { nodes, weights };
}
