import { normalPdf } from './normal-distribution';
import { quantile } from './summary-statistics';
import { validateValues } from './validate-input';

/** One histogram bin [lower, upper) (the last bin also holds its upper edge). */
export interface HistogramBin {
	lower: number;
	upper: number;
	count: number;
}

/** Histogram with fitted normal curves in counts per bin. */
export interface CapabilityHistogram {
	bins: HistogramBin[];
	binWidth: number;
	method: 'freedman-diaconis' | 'sturges' | 'single-value';
	/** Normal curves scaled to counts: n·binWidth·φ((x − μ)/σ)/σ; null where σ ≤ 0. */
	curve: { x: number; overall: number | null; within: number | null }[];
}

/** Options of `capabilityHistogram`. */
export interface HistogramOptions {
	mean: number;
	sigmaOverall: number;
	sigmaWithin?: number | null;
	lsl?: number | null;
	usl?: number | null;
	/** Cap on the number of bins (far-away spec limits would otherwise make thousands). */
	maxBins?: number;
	/** Number of curve points; default 81. */
	curvePoints?: number;
}

/**
 * Histogram of the study values with the fitted normal curve(s), the range widened to
 * include the spec limits so they can be drawn. Bin width by Freedman–Diaconis
 * (2·IQR/n^(1/3), Freedman & Diaconis 1981); Sturges (⌈log2 n⌉ + 1 bins over the data
 * range, Sturges 1926) when the IQR is 0; a single bin when all values are equal and no
 * specs are given. Edges start at the lower end of the range.
 * @throws SpcInputError for non-finite or fewer than 1 value.
 * @example capabilityHistogram([1, 2, 2, 3], { mean: 2, sigmaOverall: 0.8 }).bins.length
 */
export function capabilityHistogram(
	values: readonly number[],
	options: HistogramOptions
): CapabilityHistogram {
	const xs = validateValues(values, 'values', 1);
	const n = xs.length;
	const maxBins = options.maxBins ?? 60;
	const specs = [options.lsl, options.usl].filter(
		(v): v is number => typeof v === 'number' && Number.isFinite(v)
	);
	const dataLo = Math.min(...xs);
	const dataHi = Math.max(...xs);
	let lo = Math.min(dataLo, ...specs);
	let hi = Math.max(dataHi, ...specs);
	let method: CapabilityHistogram['method'];
	let width: number;
	const iqr = quantile(xs, 0.75) - quantile(xs, 0.25);
	if (iqr > 0) {
		method = 'freedman-diaconis';
		width = (2 * iqr) / Math.cbrt(n);
	} else if (dataHi > dataLo) {
		method = 'sturges';
		width = (dataHi - dataLo) / (Math.ceil(Math.log2(n)) + 1);
	} else if (hi > lo) {
		method = 'single-value';
		width = (hi - lo) / 10;
	} else {
		// All equal and no specs: one bin of unit width around the value.
		method = 'single-value';
		lo -= 0.5;
		hi += 0.5;
		width = 1;
	}
	let count = Math.max(1, Math.ceil((hi - lo) / width));
	if (count > maxBins) {
		count = maxBins;
		width = (hi - lo) / count;
	}
	const bins: HistogramBin[] = Array.from({ length: count }, (_, i) => ({
		lower: lo + i * width,
		upper: lo + (i + 1) * width,
		count: 0
	}));
	for (const x of xs) {
		const i = Math.min(count - 1, Math.max(0, Math.floor((x - lo) / width)));
		bins[i].count++;
	}
	const top = lo + count * width;
	const m = Math.max(2, options.curvePoints ?? 81);
	const scaled = (x: number, sigma: number | null | undefined) =>
		sigma && sigma > 0 ? (n * width * normalPdf((x - options.mean) / sigma)) / sigma : null;
	const curve = Array.from({ length: m }, (_, i) => {
		const x = lo + ((top - lo) * i) / (m - 1);
		return { x, overall: scaled(x, options.sigmaOverall), within: scaled(x, options.sigmaWithin) };
	});
	return { bins, binWidth: width, method, curve };
}
