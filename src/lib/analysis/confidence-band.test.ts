import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { linearRegression, meanResponseBand, meanResponseInterval } from './linear-regression';
import { seededRandom } from './seeded-random';

const book = JSON.parse(
	readFileSync(
		new URL('../../../reference/analysis/montgomery-runger-oxygen-purity.json', import.meta.url),
		'utf8'
	)
) as {
	x0: number;
	hydrocarbonPct: number[];
	purityPct: number[];
	printed: Record<string, number>;
};

describe('mean-response interval: Montgomery & Runger oxygen purity (§11-6.2)', () => {
	const fit = linearRegression(book.hydrocarbonPct, book.purityPct);
	const ci = meanResponseInterval(fit, book.x0, 0.95);
	it('has the printed fit, Sxx, slope and σ̂²', () => {
		expect(fit.sxx).toBeCloseTo(book.printed.sxx, 5);
		expect(fit.slope).toBeCloseTo(book.printed.slope, 3);
		expect(fit.residualSd ** 2).toBeCloseTo(book.printed.sigmaSquared, 2);
		expect(fit.xMean).toBeCloseTo(book.printed.xMean, 4);
		expect(ci.fit).toBeCloseTo(book.printed.fitAtX0, 2);
	});
	it('has the book half-width recomputed from its own printed intermediates', () => {
		// 2.101·√(1.18·(1/20 + (1.00 − 1.1960)²/0.68088)) = 0.7445 (the book rounds it to 0.75).
		const p = book.printed;
		const fromPrinted =
			p.t0025df18 * Math.sqrt(p.sigmaSquared * (1 / 20 + (book.x0 - p.xMean) ** 2 / p.sxx));
		expect(Math.abs(ci.halfWidth - fromPrinted)).toBeLessThan(0.001);
		// Against the printed limits: within one unit of the printed last digit (see the JSON note).
		expect(Math.abs(ci.halfWidth - p.halfWidth)).toBeLessThanOrEqual(0.01);
		expect(Math.abs(ci.lower - p.lower)).toBeLessThanOrEqual(0.01);
		expect(ci.upper).toBeCloseTo(p.upper, 2);
	});
	it('is narrowest at the mean of x and symmetric about it', () => {
		const band = meanResponseBand(fit, 0.8, 1.6, 81);
		const widths = band.map((b) => b.halfWidth);
		const narrowest = band[widths.indexOf(Math.min(...widths))].x;
		expect(Math.abs(narrowest - fit.xMean)).toBeLessThanOrEqual(0.005);
		const d = 0.3;
		expect(meanResponseInterval(fit, fit.xMean - d).halfWidth).toBeCloseTo(
			meanResponseInterval(fit, fit.xMean + d).halfWidth,
			12
		);
	});
});

describe('mean-response interval: coverage by simulation (first-principles check)', () => {
	it('covers the true mean about 95 % of the time at the centre and at an edge', () => {
		// Known line y = 2 + 0.5x + N(0, 1.5²) at 12 fixed x; 4000 seeded repetitions. The
		// binomial SD of a 95 % rate over 4000 trials is 0.34 %, so ±1.2 % is ±3.5 SD.
		const rng = seededRandom(17);
		const x = Array.from({ length: 12 }, (_, i) => i * 0.75);
		const trials = 4000;
		const targets = [x[0], 4.1, x[11] + 2];
		const hits = targets.map(() => 0);
		for (let t = 0; t < trials; t++) {
			const y = x.map((xi) => 2 + 0.5 * xi + 1.5 * rng.normal());
			const fit = linearRegression(x, y);
			targets.forEach((x0, k) => {
				const ci = meanResponseInterval(fit, x0, 0.95);
				const truth = 2 + 0.5 * x0;
				if (ci.lower <= truth && truth <= ci.upper) hits[k]++;
			});
		}
		for (const h of hits) expect(Math.abs(h / trials - 0.95)).toBeLessThan(0.012);
	});
});
