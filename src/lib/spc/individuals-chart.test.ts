import { describe, it, expect } from 'vitest';
import ref from '../../../reference/spc/worked-examples.json';
import { chartConstants } from './chart-constants';
import { evaluateChart } from './evaluate-chart';
import { individualsChart, individualsPoints } from './individuals-chart';

const nist = ref.nistIndividualsFlowRate;
const mr = ref.montgomeryRungerTable16_3;

describe('NIST e-Handbook §6.3.2.2 flow-rate individuals chart', () => {
	const chart = individualsChart(nist.values);
	it('moving range i belongs to point i; point 0 has none', () => {
		chart.points.forEach((p, i) => {
			if (nist.movingRanges[i] === null) expect(p.dispersion).toBeNull();
			else expect(p.dispersion).toBeCloseTo(nist.movingRanges[i] as number, 10);
		});
	});
	it('centre line and MR-bar match the published values', () => {
		expect(chart.limits.location.cl).toBeCloseTo(nist.mean, 10);
		expect(chart.limits.dispersion.cl).toBeCloseTo(nist.meanMovingRange, 4);
	});
	it('limits with the book factor 1.128 reproduce UCL/LCL to the printed 4 decimals', () => {
		const spread = (3 * chart.limits.dispersion.cl) / nist.d2Used;
		expect(chart.limits.location.cl + spread).toBeCloseTo(nist.ucl, 4);
		expect(chart.limits.location.cl - spread).toBeCloseTo(nist.lcl, 4);
	});
	it('exact limits use d2(2) = 2/√π and differ from the book only by the rounding of 1.128', () => {
		const { location, dispersion } = chart.limits;
		expect(location.ucl - location.cl).toBeCloseTo(
			(3 * dispersion.cl) / (2 / Math.sqrt(Math.PI)),
			12
		);
		const bound = 3 * dispersion.cl * Math.abs(1 / 1.128 - 1 / chartConstants(2).d2) + 1e-4;
		expect(Math.abs(location.ucl - nist.ucl)).toBeLessThan(bound);
		expect(Math.abs(location.lcl - nist.lcl)).toBeLessThan(bound);
	});
	it('MR-chart UCL = D4(2)·MR̄ ≈ 3.267·MR̄, LCL 0', () => {
		expect(chart.limits.dispersion.lcl).toBe(0);
		expect(Math.abs(chart.limits.dispersion.ucl - nist.mrUcl)).toBeLessThan(1e-3);
		expect(chart.limits.sigmaWithin).toBeCloseTo(
			chart.limits.dispersion.cl / chartConstants(2).d2,
			14
		);
	});
	it('"The process is in control": no point beyond the limits', () => {
		expect(evaluateChart(chart.points, chart.limits, ['we-1'])).toEqual([]);
	});
});

describe('Montgomery & Runger Table 16-3 individuals chart', () => {
	const chart = individualsChart(mr.values);
	it('full-precision mean and MR-bar', () => {
		expect(chart.limits.location.cl).toBeCloseTo(mr.fullPrecision.mean, 10);
		expect(chart.limits.dispersion.cl).toBeCloseTo(mr.fullPrecision.meanMovingRange, 6);
	});
	it('with the book factor 1.128 the unrounded limits are 105.982 / 92.208', () => {
		const spread = (3 * chart.limits.dispersion.cl) / 1.128;
		expect(chart.limits.location.cl + spread).toBeCloseTo(mr.fullPrecision.ucl, 3);
		expect(chart.limits.location.cl - spread).toBeCloseTo(mr.fullPrecision.lcl, 3);
	});
	it('the published rounded limits 105.99 / 92.21 are within 0.01 of the exact ones', () => {
		expect(Math.abs(chart.limits.location.ucl - mr.published.ucl)).toBeLessThan(0.015);
		expect(Math.abs(chart.limits.location.lcl - mr.published.lcl)).toBeLessThan(0.015);
	});
});

describe('Phase I exclusions', () => {
	it('excluded points leave the mean, and moving ranges touching them leave MR-bar', () => {
		// kept 1, 2, 3, 4; ranges with both ends kept: |2−1| and |4−3| → MR̄ = 1
		const chart = individualsChart([1, 2, 10, 3, 4], { exclude: [2] });
		expect(chart.limits.location.cl).toBe(2.5);
		expect(chart.limits.dispersion.cl).toBe(1);
		expect(chart.limits.baselineIndices).toEqual([0, 1, 3, 4]);
		expect(chart.points).toHaveLength(5);
	});
	it('an exclusion list leaving no adjacent pair is refused', () => {
		expect(() => individualsChart([1, 2, 3], { exclude: [1] })).toThrow(
			/exclude: leaves no two consecutive/
		);
	});
	it.each([[[5]], [[-1]], [[1.5]]])('exclude index %j out of range is refused', (exclude) => {
		expect(() => individualsChart([1, 2, 3], { exclude })).toThrow(/exclude\[0\]: index/);
	});
});

describe('bad input', () => {
	it.each([
		[[], /values: needs at least 2 values, got 0/],
		[[4], /values: needs at least 2 values, got 1/],
		[[1, NaN, 3], /values\[1\]: is NaN/],
		[[1, 'x', 3], /values\[1\]: is "x"/],
		[[1, Infinity], /values\[1\]: is Infinity/],
		['1,2,3', /values: expected an array/]
	])('%j → %s', (values, message) => {
		expect(() => individualsPoints(values)).toThrow(message);
	});
	it('two values are enough (n = 1 moving range) and inputs are not mutated', () => {
		const values = Object.freeze([3, 5]);
		const chart = individualsChart(values);
		expect(chart.limits.dispersion.cl).toBe(2);
		expect(values).toEqual([3, 5]);
	});
	it('zero spread collapses the limits onto the centre line without NaN', () => {
		const { limits } = individualsChart([7, 7, 7]);
		expect(limits.location).toEqual({ lcl: 7, cl: 7, ucl: 7 });
		expect(limits.sigmaWithin).toBe(0);
	});
});
