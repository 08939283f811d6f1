import { describe, expect, it } from 'vitest';
import { seededRandom } from './seeded-random';
import {
	analyseTransferEfficiency,
	areaRatioBin,
	summarizeTeBin,
	TE_BUCKET_MAX,
	TE_BUCKET_WIDTH,
	type TeHistogramRow
} from './te-bins';
import {
	fitTeCurve,
	learnedMinAreaRatio,
	predictTe,
	teBandAt,
	type TeBinPoint,
	type TeCurve
} from './te-model';

const TRUTH: TeCurve = { upper: 0.95, lower: 0.35, knee: 0.6, scale: 0.06 };
/** Closed form of the true limit at floor 0.70: knee − scale·ln((U − L)/(floor − L) − 1). */
const TRUE_LIMIT = 0.6 - 0.06 * Math.log(0.6 / 0.35 - 1);

/** Per-pad synthetic data binned the way the SQL query bins it. */
function syntheticRows(seed: number, curve: TeCurve, sdTe: number, arFrom = 0.35, arTo = 1.6) {
	const rng = seededRandom(seed);
	const cells = new Map<string, TeHistogramRow>();
	for (let a = 0; a < 250; a++) {
		const ar = arFrom + (arTo - arFrom) * rng.uniform();
		const pads = 20 + Math.floor(rng.uniform() * 60);
		for (let k = 0; k < pads; k++) {
			// 1 % gross outliers (a smeared or missing deposit) that the MAD rule should drop.
			const te =
				rng.uniform() < 0.01
					? 2.5 + rng.uniform()
					: Math.max(0, predictTe(curve, ar) + sdTe * rng.normal());
			const bin = areaRatioBin(ar);
			const bucket = Math.min(TE_BUCKET_MAX, Math.floor(te / TE_BUCKET_WIDTH));
			const key = `${bin}:${bucket}`;
			const cell = cells.get(key) ?? { bin, bucket, count: 0, teSum: 0, areaRatioSum: 0 };
			cell.count++;
			cell.teSum += te;
			cell.areaRatioSum += ar;
			cells.set(key, cell);
		}
	}
	return [...cells.values()];
}

describe('TE curve fit (4-parameter logistic, weighted Levenberg–Marquardt)', () => {
	it('returns the exact curve from noise-free bin means', () => {
		const points: TeBinPoint[] = Array.from({ length: 20 }, (_, i) => {
			const ar = 0.35 + i * 0.06;
			return { areaRatio: ar, te: predictTe(TRUTH, ar), n: 50 + 10 * i };
		});
		const { fit } = fitTeCurve(points);
		expect(fit).not.toBeNull();
		const c = fit!.coefficients;
		expect(c.upper).toBeCloseTo(TRUTH.upper, 6);
		expect(c.lower).toBeCloseTo(TRUTH.lower, 6);
		expect(c.knee).toBeCloseTo(TRUTH.knee, 6);
		expect(c.scale).toBeCloseTo(TRUTH.scale, 6);
	});

	it('recovers the known curve and limit of a seeded synthetic data set', () => {
		const result = analyseTransferEfficiency(syntheticRows(7, TRUTH, 0.08), 0.7);
		expect(result.fit).not.toBeNull();
		const c = result.fit!.coefficients;
		expect(Math.abs(c.upper - TRUTH.upper)).toBeLessThan(0.02);
		expect(Math.abs(c.lower - TRUTH.lower)).toBeLessThan(0.05);
		expect(Math.abs(c.knee - TRUTH.knee)).toBeLessThan(0.02);
		expect(Math.abs(c.scale - TRUTH.scale)).toBeLessThan(0.02);
		expect(Math.abs(result.learnedMinAreaRatio! - TRUE_LIMIT)).toBeLessThan(0.015);
		const [from, to] = result.learnedMinAreaRatioInterval!;
		expect(from!).toBeLessThan(result.learnedMinAreaRatio!);
		expect(to).toBeGreaterThan(result.learnedMinAreaRatio!);
		// The outliers went: about 1 % of the pads, nearly all of them.
		expect(result.trimmed / (result.n + result.trimmed)).toBeGreaterThan(0.008);
		expect(result.trimmed / (result.n + result.trimmed)).toBeLessThan(0.02);
		// The true curve lies inside the band at most band points (pointwise 95 %).
		const inside = result.fit!.band.filter((b) => {
			const t = predictTe(TRUTH, b.areaRatio);
			return b.lower <= t && t <= b.upper;
		}).length;
		expect(inside / result.fit!.band.length).toBeGreaterThan(0.8);
	});

	it('band covers the true mean TE about 95 % of the time (seeded simulation)', () => {
		// 400 data sets of 18 bin means with SE σ/√n; count how often the band holds the truth
		// at the knee and on the plateau. Delta-method bands are approximate: allow ±4 %
		// (binomial SD of 95 % over 400 is 1.1 %).
		const rng = seededRandom(99);
		const ars = Array.from({ length: 18 }, (_, i) => 0.4 + i * 0.06);
		const at = [0.6, 1.2];
		const hits = [0, 0];
		const trials = 400;
		for (let t = 0; t < trials; t++) {
			const points = ars.map((ar) => {
				const n = 200;
				return { areaRatio: ar, te: predictTe(TRUTH, ar) + (0.1 / Math.sqrt(n)) * rng.normal(), n };
			});
			const { fit } = fitTeCurve(points);
			at.forEach((ar, k) => {
				const b = teBandAt(fit!, ar);
				const truth = predictTe(TRUTH, ar);
				if (b.lower <= truth && truth <= b.upper) hits[k]++;
			});
		}
		for (const h of hits) expect(Math.abs(h / trials - 0.95)).toBeLessThan(0.04);
	});
});

describe('learned limit: null with a reason when the data cannot support one', () => {
	it('too few bins', () => {
		const rows = syntheticRows(3, TRUTH, 0.08, 0.55, 0.75);
		const r = analyseTransferEfficiency(rows, 0.7);
		expect(r.learnedMinAreaRatio).toBeNull();
		expect(r.reason).toMatch(/too few area-ratio bins/);
	});
	it('no crossing inside the data (only large area ratios, flat TE)', () => {
		const r = analyseTransferEfficiency(syntheticRows(4, TRUTH, 0.05, 0.9, 2.0), 0.7);
		expect(r.learnedMinAreaRatio).toBeNull();
		expect(r.reason).toMatch(/no fall|limit lies below the data|determine/);
	});
	it('plateau below the floor', () => {
		const low: TeCurve = { upper: 0.62, lower: 0.3, knee: 0.6, scale: 0.06 };
		const r = analyseTransferEfficiency(syntheticRows(5, low, 0.05), 0.7);
		expect(r.learnedMinAreaRatio).toBeNull();
		expect(r.reason).toMatch(/below the floor/);
	});
	it('band too wide', () => {
		// Few pads per bin and very noisy deposits.
		const points: TeBinPoint[] = Array.from({ length: 8 }, (_, i) => {
			const ar = 0.4 + i * 0.1;
			const wobble = [0.25, -0.2, 0.3, -0.25, 0.2, -0.3, 0.25, -0.2][i];
			return { areaRatio: ar, te: predictTe(TRUTH, ar) + wobble, n: 2 };
		});
		const limit = learnedMinAreaRatio(fitTeCurve(points), 0.7);
		expect(limit.areaRatio).toBeNull();
		expect(limit.reason).toMatch(/too wide|determine|below the data/);
	});
});

describe('summarizeTeBin', () => {
	it('gives quantiles within one bucket of the exact sample quantiles and drops outliers', () => {
		const rng = seededRandom(11);
		const values = Array.from({ length: 5000 }, () => 0.9 + 0.07 * rng.normal());
		values.push(0.05, 0.02, 2.9, 2.95, 3.4);
		const cells = new Map<number, TeHistogramRow>();
		for (const v of values) {
			const bucket = Math.min(TE_BUCKET_MAX, Math.floor(v / TE_BUCKET_WIDTH));
			const c = cells.get(bucket) ?? { bin: 0, bucket, count: 0, teSum: 0, areaRatioSum: 0 };
			c.count++;
			c.teSum += v;
			c.areaRatioSum += 0.8;
			cells.set(bucket, c);
		}
		const s = summarizeTeBin([...cells.values()])!;
		// The rule keeps median ± 3·1.4826·MAD ≈ 0.9 ± 3σ (σ = 0.07): the five gross outliers
		// go, and so does the normal tail beyond 3σ (0.27 % of 5000 ≈ 13, bucket-rounded).
		expect(s.n + s.trimmed).toBe(5005);
		expect(s.trimmed).toBeGreaterThanOrEqual(5);
		expect(s.trimmed).toBeLessThanOrEqual(5 + 40);
		const kept = values.filter((v) => Math.abs(v - 0.9) <= 3 * 0.07).sort((a, b) => a - b);
		const q = (p: number) => kept[Math.floor(p * (kept.length - 1))];
		expect(Math.abs(s.teP10 - q(0.1))).toBeLessThan(TE_BUCKET_WIDTH);
		expect(Math.abs(s.teP90 - q(0.9))).toBeLessThan(TE_BUCKET_WIDTH);
		expect(Math.abs(s.teMean - kept.reduce((a, b) => a + b, 0) / kept.length)).toBeLessThan(0.002);
		expect(s.areaRatio).toBeCloseTo(0.8, 12);
	});
	it('returns null for an empty bin and refuses bad rows', () => {
		expect(summarizeTeBin([])).toBeNull();
		expect(() =>
			summarizeTeBin([{ bin: 0, bucket: 999, count: 1, teSum: 1, areaRatioSum: 1 }])
		).toThrow(/outside/);
	});
});
