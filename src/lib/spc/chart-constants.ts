import { logGamma } from './gamma-functions';
import { gaussLegendre } from './gauss-legendre';
import { normalCdf, normalPdf } from './normal-distribution';

/**
 * Shewhart control-chart constants for one subgroup size n, unrounded.
 * d2 = E[W], d3 = sd[W] for W the range of n standard normals; c4 = E[s]/σ.
 */
export interface ChartConstants {
	n: number;
	d2: number;
	d3: number;
	c4: number;
	/** X̄ limits from R̄: 3/(d2√n). */
	A2: number;
	/** X̄ limits from s̄: 3/(c4√n). */
	A3: number;
	/** R-chart LCL factor: max(0, 1 − 3d3/d2). */
	D3: number;
	/** R-chart UCL factor: 1 + 3d3/d2. */
	D4: number;
	/** S-chart LCL factor: max(0, 1 − 3√(1−c4²)/c4). */
	B3: number;
	/** S-chart UCL factor: 1 + 3√(1−c4²)/c4. */
	B4: number;
}

/** Smallest subgroup size of any variables chart with subgroups. */
export const MIN_SUBGROUP_SIZE = 2;
/** Largest n of `chartConstants` (the span of the published tables); c4 has no limit. */
export const MAX_RANGE_SUBGROUP_SIZE = 25;

// Integration grids. x: trapezoidal rule on [−X_MAX, X_MAX] (spectrally accurate for these
// smooth, Gaussian-decaying integrands). r: composite Gauss–Legendre on [0, R_MAX], because
// the range integrand has a kink at r = 0. Truncation error is far below 1e-12.
const X_MAX = 9;
const X_STEP = 0.1;
const R_MAX = 12;
const R_PANELS = 12;
const GL_POINTS = 10;

interface Grid {
	x: Float64Array;
	phi: Float64Array;
	cdf: Float64Array;
	r: Float64Array;
	rWeight: Float64Array;
	/** diff[j·nx + i] = Φ(x_i + r_j) − Φ(x_i) */
	diff: Float64Array;
}

let grid: Grid | null = null;
const cache = new Map<number, ChartConstants>();

function buildGrid(): Grid {
	const nx = Math.round((2 * X_MAX) / X_STEP) + 1;
	const x = new Float64Array(nx);
	const phi = new Float64Array(nx);
	const cdf = new Float64Array(nx);
	for (let i = 0; i < nx; i++) {
		x[i] = -X_MAX + i * X_STEP;
		phi[i] = normalPdf(x[i]);
		cdf[i] = normalCdf(x[i]);
	}
	const gl = gaussLegendre(GL_POINTS);
	const panel = R_MAX / R_PANELS;
	const nr = R_PANELS * GL_POINTS;
	const r = new Float64Array(nr);
	const rWeight = new Float64Array(nr);
	for (let p = 0; p < R_PANELS; p++) {
		for (let k = 0; k < GL_POINTS; k++) {
			r[p * GL_POINTS + k] = panel * (p + 0.5 + 0.5 * gl.nodes[k]);
			rWeight[p * GL_POINTS + k] = 0.5 * panel * gl.weights[k];
		}
	}
	const diff = new Float64Array(nr * nx);
	for (let j = 0; j < nr; j++) {
		for (let i = 0; i < nx; i++) diff[j * nx + i] = normalCdf(x[i] + r[j]) - cdf[i];
	}
	return { x, phi, cdf, r, rWeight, diff };
}

/** d2 = ∫[1 − Φ(x)ⁿ − (1 − Φ(x))ⁿ] dx (Tippett 1925). */
function rangeMean(g: Grid, n: number): number {
	let sum = 0;
	for (let i = 0; i < g.x.length; i++) {
		sum += 1 - Math.pow(g.cdf[i], n) - Math.pow(1 - g.cdf[i], n);
	}
	return sum * X_STEP;
}

/** E[W²] = 2∫₀^∞ r(1 − F_W(r)) dr with F_W(r) = n∫φ(x)[Φ(x+r) − Φ(x)]ⁿ⁻¹ dx. */
function rangeSecondMoment(g: Grid, n: number): number {
	const nx = g.x.length;
	let outer = 0;
	for (let j = 0; j < g.r.length; j++) {
		let inner = 0;
		const base = j * nx;
		for (let i = 0; i < nx; i++) inner += g.phi[i] * Math.pow(g.diff[base + i], n - 1);
		const survival = 1 - n * inner * X_STEP;
		outer += g.rWeight[j] * g.r[j] * survival;
	}
	return 2 * outer;
}

/**
 * c4(n) = √(2/(n−1))·Γ(n/2)/Γ((n−1)/2): E[s]/σ for samples of n normal values (ddof 1).
 *
 * Used for X̄/S limits and σ̂ = s̄/c4; valid for any n ≥ 2 (no table needed).
 * Reference: Montgomery, Introduction to Statistical Quality Control, App. VI.
 * @throws RangeError when n is not an integer ≥ 2.
 * @example c4(2) // √(2/π) = 0.7978845608028654
 */
export function c4(n: number): number {
	if (!Number.isInteger(n) || n < 2) {
		throw new RangeError(`c4: n must be an integer ≥ 2, got ${n}`);
	}
	return Math.sqrt(2 / (n - 1)) * Math.exp(logGamma(n / 2) - logGamma((n - 1) / 2));
}

/**
 * Factors for the X̄/S chart from c4 alone, for any subgroup size n ≥ 2:
 * A3 = 3/(c4√n), B3 = max(0, 1 − 3√(1−c4²)/c4), B4 = 1 + 3√(1−c4²)/c4.
 * @throws RangeError when n is not an integer ≥ 2.
 * @example standardDeviationFactors(5).B4 // ≈ 2.089
 */
export function standardDeviationFactors(n: number): {
	c4: number;
	A3: number;
	B3: number;
	B4: number;
} {
	const c = c4(n);
	const spread = (3 * Math.sqrt(1 - c * c)) / c;
	return { c4: c, A3: 3 / (c * Math.sqrt(n)), B3: Math.max(0, 1 - spread), B4: 1 + spread };
}

/**
 * All Shewhart constants for subgroup size n (2..25), computed from first principles by
 * numerical integration (d2, d3), log-gamma (c4) and the standard formulas (A2, A3, D3, D4,
 * B3, B4). Computed lazily on first use and cached; later calls are a map lookup.
 *
 * Used by every variables chart. Reference: Tippett (1925) for d2; Montgomery, ISQC App. VI
 * and ASTM E2587 for the definitions; values checked in chart-constants.test.ts against the
 * published tables (reference/spc/control-chart-constants.json).
 * @throws RangeError when n is not an integer in 2..25.
 * @example chartConstants(5).A2 // 0.5768…
 */
export function chartConstants(n: number): ChartConstants {
	const hit = cache.get(n);
	if (hit) return hit;
	if (!Number.isInteger(n) || n < MIN_SUBGROUP_SIZE || n > MAX_RANGE_SUBGROUP_SIZE) {
		throw new RangeError(
			`chartConstants: n must be an integer from ${MIN_SUBGROUP_SIZE} to ` +
				`${MAX_RANGE_SUBGROUP_SIZE}, got ${n}`
		);
	}
	grid ??= buildGrid();
	const d2 = rangeMean(grid, n);
	const d3 = Math.sqrt(rangeSecondMoment(grid, n) - d2 * d2);
	const s = standardDeviationFactors(n);
	const constants: ChartConstants = {
		n,
		d2,
		d3,
		c4: s.c4,
		A2: 3 / (d2 * Math.sqrt(n)),
		A3: s.A3,
		D3: Math.max(0, 1 - (3 * d3) / d2),
		D4: 1 + (3 * d3) / d2,
		B3: s.B3,
		B4: s.B4
	};
	cache.set(n, constants);
	return constants;
}

/**
 * The whole table n = 2..25, e.g. for a reference page in the UI.
 * @example chartConstantsTable().length // 24
 */
export function chartConstantsTable(): ChartConstants[] {
	const rows: ChartConstants[] = [];
	for (let n = MIN_SUBGROUP_SIZE; n <= MAX_RANGE_SUBGROUP_SIZE; n++) rows.push(chartConstants(n));
	return rows;
}
