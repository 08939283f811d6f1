import { describe, expect, it } from 'vitest';
import ref from '../../../reference/spc/worked-examples.json';
import { DEFAULT_CAPABILITY_THRESHOLDS } from './capability-assessment';
import { computeChart, needsPadEvidence, pointsFor, type ChartInputs } from './chart-detail';
import type { ChartCharacteristic, SourceSubgroup } from './chart-input';
import { processCapability } from './capability';

const nist = ref.nistIndividualsFlowRate;

const characteristic: ChartCharacteristic = {
	name: 'Flow rate',
	productCode: 'PB-100',
	measure: 'print-parameter',
	parameterKey: 'squeegeeSpeedMmS',
	chartKind: 'i-mr',
	subgroupMode: 'board',
	subgroupSize: 1,
	lsl: 40,
	target: 50,
	usl: 60,
	unit: 'mm/s',
	rules: ['we-1', 'not-a-rule']
};

const runs = (values: readonly number[]): SourceSubgroup[] =>
	values.map((v, i) => ({
		key: `run:${i + 1}`,
		label: `run ${i + 1}`,
		boardId: null,
		boardIds: [],
		at: new Date(Date.UTC(2026, 0, 1, 0, i)),
		values: [v]
	}));

const inputs = (over: Partial<ChartInputs> = {}): ChartInputs => ({
	characteristic,
	subgroups: runs(nist.values),
	frozen: null,
	exclusions: [],
	openSignals: [],
	thresholds: DEFAULT_CAPABILITY_THRESHOLDS,
	...over
});

describe('computeChart', () => {
	it('Phase I limits of the NIST individuals example (section 6.3.2.2)', () => {
		const out = computeChart(inputs());
		expect(out.message).toBeNull();
		expect(out.chart?.phase).toBe('I');
		// NIST prints 4 decimals from d2 = 1.128; the engine's exact d2 moves the limits < 0.002.
		expect(Math.abs(out.chart!.limits.location.ucl - nist.ucl)).toBeLessThan(0.002);
		expect(Math.abs(out.chart!.limits.location.lcl - nist.lcl)).toBeLessThan(0.002);
		expect(Math.abs(out.chart!.limits.dispersion.ucl - nist.mrUcl)).toBeLessThan(0.002);
		// Unknown stored rule ids are skipped, known ones kept.
		expect(out.chart?.rules).toEqual(['we-1']);
		expect(out.chart?.points.map((p) => p.key)).toEqual(runs(nist.values).map((s) => s.key));
	});

	it('capability of the values with within sigma from the limits', () => {
		const out = computeChart(inputs());
		const expected = processCapability({
			values: nist.values,
			sigmaWithin: out.chart!.limits.sigmaWithin,
			lsl: 40,
			usl: 60,
			target: 50
		});
		expect(out.capability.result?.cpk).toBeCloseTo(expected.cpk!, 12);
		expect(out.capability.histogram).not.toBeNull();
	});

	it('judges against frozen limits of the same kind and size (Phase II)', () => {
		const frozenLimits = computeChart(inputs()).chart!.limits;
		const out = computeChart(inputs({ frozen: { version: 3, limits: frozenLimits } }));
		expect(out.chart?.phase).toBe('II');
		expect(out.chart?.limitsVersion).toBe(3);
		expect(out.message).toBeNull();
	});

	it('computes Phase I limits, and says so, when the chart type changed since the frozen ones', () => {
		const frozenLimits = { ...computeChart(inputs()).chart!.limits, kind: 'xbar-r' as const };
		const out = computeChart(inputs({ frozen: { version: 2, limits: frozenLimits } }));
		expect(out.chart?.phase).toBe('I');
		expect(out.message).toContain('since limits v2');
	});

	it('leaves excluded points out of the Phase I limits and marks them', () => {
		const values = [...nist.values.slice(0, 10), 90];
		const all = computeChart(inputs({ subgroups: runs(values) }));
		const out = computeChart(
			inputs({ subgroups: runs(values), exclusions: [{ key: 'run:11', reason: 'Paste lot swap' }] })
		);
		expect(out.chart?.points[10]).toMatchObject({
			excluded: true,
			excludeReason: 'Paste lot swap'
		});
		expect(out.chart!.limits.location.cl).toBeLessThan(all.chart!.limits.location.cl);
	});

	it('names why there is no chart: no data, zero variation', () => {
		const none = computeChart(inputs({ subgroups: [] }));
		expect(none.chart).toBeNull();
		expect(none.message).toMatch(/^No print runs of PB-100 with .* logged yet\.$/);
		expect(none.capability.assessment.verdict).toBe('not-assessed');
		const flat = computeChart(inputs({ subgroups: runs([5, 5, 5, 5]) }));
		expect(flat.chart).toBeNull();
		expect(flat.message).toContain('Zero variation');
	});

	it('per-board aggregates: capability pooled, histogram and observed from the loaded pads', () => {
		const boards: SourceSubgroup[] = [
			{ n: 4, mean: 100, sd: 2, range: 5 },
			{ n: 4, mean: 102, sd: 3, range: 7 },
			{ n: 4, mean: 99, sd: 2.5, range: 6 }
		].map((stats, i) => ({
			key: `board:${i + 1}`,
			label: `B${i + 1}`,
			boardId: i + 1,
			boardIds: [i + 1],
			at: null,
			values: [],
			stats
		}));
		const c = { ...characteristic, measure: 'volume-pct', chartKind: 'xbar-r', lsl: 80, usl: 120 };
		expect(needsPadEvidence(c, boards)).toBe(true);
		expect(needsPadEvidence({ lsl: null, usl: null }, boards)).toBe(false);
		expect(pointsFor('xbar-r', boards).map((p) => p.dispersion)).toEqual([5, 7, 6]);
		const observed = { n: 12, belowLsl: 0, aboveUsl: 1 };
		const out = computeChart(
			inputs({
				characteristic: c,
				subgroups: boards,
				pads: { values: [98, 100, 101, 103, 121], observed }
			})
		);
		expect(out.capability.result?.n).toBe(12);
		expect(out.capability.histogram).not.toBeNull();
		// 1 pad of 12 above the USL: 83,333 ppm observed (1e6 / 12).
		expect(out.capability.assessment.observed).toMatchObject({ n: 12, count: 1 });
		expect(out.capability.assessment.observed?.total).toBeCloseTo(1e6 / 12, 6);
	});
});
