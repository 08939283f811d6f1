import { describe, it, expect } from 'vitest';
import examples from '../../../reference/stencil/worked-examples.json';
import { COMMON_FOIL_THICKNESSES_UM, thicknessSweep } from './thickness-sweep';
import { IPC_7525_THRESHOLDS } from './thresholds';
import { rect } from './test-fixtures';

const qfp = rect(1000, 200, { refdes: 'U1' });
const chip = rect(300, 280, { refdes: 'C1' });
const ex = examples.issueExamples.thicknessSweepOfBoth;

describe('thicknessSweep over the common-practice foil list', () => {
	const sweep = thicknessSweep([qfp, chip], { thresholds: IPC_7525_THRESHOLDS });
	it('uses the documented list, ascending', () => {
		expect(sweep.series.map((p) => p.thicknessUm)).toEqual([...COMMON_FOIL_THICKNESSES_UM]);
	});
	it('pass shares follow from the max passing thicknesses 126.26 and 109.72 µm', () => {
		for (const p of sweep.series) {
			expect(p.passShare).toBe(ex.passShareByThicknessUm[String(p.thicknessUm) as keyof typeof ex.passShareByThicknessUm]);
			expect(p.total).toBe(2);
		}
	});
	it('recommends the thickest foil where all pass: 100 µm', () => {
		expect(sweep.recommendedThicknessUm).toBe(ex.recommendedThicknessUmAllPass);
		expect(sweep.requiredPassShare).toBe(1);
	});
	it('with 50 % required: 120 µm', () => {
		expect(thicknessSweep([qfp, chip], { thresholds: IPC_7525_THRESHOLDS, requiredPassShare: 0.5 }).recommendedThicknessUm).toBe(
			ex.recommendedThicknessUmHalfPass
		);
	});
});

describe('thicknessSweep edge cases', () => {
	it('given list is de-duplicated and sorted', () => {
		const s = thicknessSweep([qfp], { thresholds: IPC_7525_THRESHOLDS, thicknessesUm: [150, 100, 100] });
		expect(s.series.map((p) => [p.thicknessUm, p.passing])).toEqual([[100, 1], [150, 0]]);
	});
	it('no foil passes → null recommendation', () => {
		expect(thicknessSweep([rect(100, 100)], { thresholds: IPC_7525_THRESHOLDS }).recommendedThicknessUm).toBeNull();
	});
	it('no apertures → null shares and null recommendation', () => {
		const s = thicknessSweep([], { thresholds: IPC_7525_THRESHOLDS, thicknessesUm: [100] });
		expect(s.series).toEqual([{ thicknessUm: 100, passing: 0, total: 0, passShare: null }]);
		expect(s.recommendedThicknessUm).toBeNull();
	});
	it('a foil exactly at the limit counts as passing (≥)', () => {
		// 264 µm square at 100 µm: AR = 0.66 exactly
		expect(thicknessSweep([rect(264, 264)], { thresholds: IPC_7525_THRESHOLDS, thicknessesUm: [100] }).series[0].passing).toBe(1);
	});
	it('bad thickness or share → clear error', () => {
		expect(() => thicknessSweep([qfp], { thresholds: IPC_7525_THRESHOLDS, thicknessesUm: [100, -5] })).toThrow(
			/thickness sweep, thicknessesUm\[1\]: must be a finite number greater than 0/
		);
		expect(() => thicknessSweep([qfp], { thresholds: IPC_7525_THRESHOLDS, requiredPassShare: 1.5 })).toThrow(/requiredPassShare: must be between 0 and 1/);
	});
});
