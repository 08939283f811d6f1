import { describe, it, expect } from 'vitest';
import type { ApertureInput } from './aperture';
import { evaluateStencil } from './evaluate-stencil';
import { summarizeStencil } from './summary';
import { IPC_7525_THRESHOLDS } from './thresholds';
import { StencilInputError } from './stencil-input-error';
import { circle, rect } from './test-fixtures';

const board: ApertureInput[] = [
	rect(1000, 200, { refdes: 'U1', pad: '1', xUm: 1000, yUm: 1000 }), // max T 126.26
	rect(300, 280, { refdes: 'C1', pad: '1', xUm: 20000, yUm: 1000 }), // max T 109.72
	circle(750, { refdes: 'U2', pad: 'A1', xUm: 40000, yUm: 1000 }) // AR 750/(4T)
];

describe('evaluateStencil with a step region', () => {
	const settings = {
		thicknessUm: 120,
		thresholds: IPC_7525_THRESHOLDS,
		stepRegions: [{ xMinUm: 15000, yMinUm: 0, xMaxUm: 25000, yMaxUm: 5000, thicknessUm: 100 }]
	};
	const results = evaluateStencil(board, settings);
	it('tags results with index, refdes and pad', () => {
		expect(results.map((r) => [r.index, r.refdes, r.pad])).toEqual([
			[0, 'U1', '1'],
			[1, 'C1', '1'],
			[2, 'U2', 'A1']
		]);
	});
	it('the 0201 inside the 100 µm step passes; outside it would fail at 120 µm', () => {
		expect(results[1].thicknessUm).toBe(100);
		expect(results[1].status).toBe('pass');
		expect(evaluateStencil(board, { ...settings, stepRegions: [] })[1].status).toBe('fail');
	});
	it('summary: counts, worst ratios with their apertures, totals', () => {
		const s = summarizeStencil(results);
		expect(s).toMatchObject({
			total: 3,
			passCount: 3,
			failCount: 0,
			failAreaRatioCount: 0,
			thicknessesUm: [100, 120]
		});
		expect(s.worstAreaRatio).toMatchObject({ refdes: 'U1', index: 0 });
		expect(s.worstAreaRatio!.value).toBeCloseTo(200000 / (2400 * 120), 12);
		expect(s.smallestOpening).toMatchObject({ refdes: 'U1', value: 200 });
		expect(s.maxPassingThicknessUm!.value).toBeCloseTo(84000 / (1160 * 0.66), 9);
		const vol = 200000 * 120 + 84000 * 100 + ((Math.PI * 750 ** 2) / 4) * 120;
		expect(s.totalVolumeUm3).toBeCloseTo(vol, 3);
	});
});

describe('summarizeStencil edge cases', () => {
	it('empty stencil', () => {
		expect(summarizeStencil([])).toEqual({
			total: 0,
			passCount: 0,
			failCount: 0,
			failAreaRatioCount: 0,
			failAspectRatioCount: 0,
			worstAreaRatio: null,
			worstAspectRatio: null,
			smallestOpening: null,
			maxPassingThicknessUm: null,
			totalAreaUm2: 0,
			totalVolumeUm3: 0,
			thicknessesUm: []
		});
	});
	it('one failing aperture counted under both limits', () => {
		const s = summarizeStencil(
			evaluateStencil([rect(150, 150)], { thicknessUm: 150, thresholds: IPC_7525_THRESHOLDS })
		);
		expect(s).toMatchObject({
			total: 1,
			failCount: 1,
			failAreaRatioCount: 1,
			failAspectRatioCount: 1
		});
	});
	it('ties keep the first aperture', () => {
		const r = evaluateStencil([rect(200, 200, { refdes: 'A' }), rect(200, 200, { refdes: 'B' })], {
			thicknessUm: 100,
			thresholds: IPC_7525_THRESHOLDS
		});
		expect(summarizeStencil(r).worstAreaRatio!.refdes).toBe('A');
	});
});

describe('evaluateStencil input errors (all-or-nothing)', () => {
	it('lists the problems of every bad aperture with its label', () => {
		try {
			evaluateStencil([rect(0, 1, { refdes: 'R1' }), circle(NaN, { refdes: '', pad: '' })], {
				thicknessUm: 0,
				thresholds: IPC_7525_THRESHOLDS
			});
		} catch (e) {
			expect(e).toBeInstanceOf(StencilInputError);
			expect((e as StencilInputError).problems.map((p) => `${p.where}/${p.field}`)).toEqual([
				'stencil/thicknessUm',
				'R1.1/lengthUm',
				'aperture #2/diameterUm'
			]);
		}
		expect.assertions(2);
	});
	it('caps the list at 100 problems and counts the rest', () => {
		const bad = Array.from({ length: 150 }, () => rect(0, 100));
		try {
			evaluateStencil(bad, { thicknessUm: 100, thresholds: IPC_7525_THRESHOLDS });
		} catch (e) {
			const p = (e as StencilInputError).problems;
			expect(p).toHaveLength(101);
			expect(p[100].message).toBe('50 more problems not listed');
		}
		expect.assertions(2);
	});
});

describe('performance', () => {
	it('20,000 apertures evaluate quickly (O(n))', () => {
		const many: ApertureInput[] = Array.from({ length: 20000 }, (_, i) =>
			i % 2
				? rect(1000, 200, { xUm: i * 10, pad: String(i) })
				: circle(300, { xUm: i * 10, pad: String(i) })
		);
		const settings = { thicknessUm: 120, thresholds: IPC_7525_THRESHOLDS };
		evaluateStencil(many.slice(0, 2000), settings); // warm up the JIT
		const t0 = performance.now();
		const r = evaluateStencil(many, settings);
		const ms = performance.now() - t0;
		expect(r).toHaveLength(20000);
		// Typically a few tens of ms. The bound is loose because the test machine is shared;
		// it still catches an O(n²) slip (4·10⁸ steps would take seconds).
		expect(ms).toBeLessThan(2000);
	});
});
