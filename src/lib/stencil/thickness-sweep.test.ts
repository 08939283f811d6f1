import { describe, it, expect } from 'vitest';
import examples from '../../../reference/stencil/worked-examples.json';
import { COMMON_FOIL_THICKNESSES_UM, thicknessSweep } from './thickness-sweep';
import { IPC_7525_THRESHOLDS } from './thresholds';
import { circle, rect } from './test-fixtures';
import { evaluateStencil } from './evaluate-stencil';

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
			expect(p.passShare).toBe(
				ex.passShareByThicknessUm[String(p.thicknessUm) as keyof typeof ex.passShareByThicknessUm]
			);
			expect(p.total).toBe(2);
		}
	});
	it('recommends the thickest foil where all pass: 100 µm', () => {
		expect(sweep.recommendedThicknessUm).toBe(ex.recommendedThicknessUmAllPass);
		expect(sweep.requiredPassShare).toBe(1);
	});
	it('with 50 % required: 120 µm', () => {
		expect(
			thicknessSweep([qfp, chip], { thresholds: IPC_7525_THRESHOLDS, requiredPassShare: 0.5 })
				.recommendedThicknessUm
		).toBe(ex.recommendedThicknessUmHalfPass);
	});
});

describe('thicknessSweep edge cases', () => {
	it('given list is de-duplicated and sorted', () => {
		const s = thicknessSweep([qfp], {
			thresholds: IPC_7525_THRESHOLDS,
			thicknessesUm: [150, 100, 100]
		});
		expect(s.series.map((p) => [p.thicknessUm, p.passing])).toEqual([
			[100, 1],
			[150, 0]
		]);
	});
	it('no foil passes → null recommendation', () => {
		expect(
			thicknessSweep([rect(100, 100)], { thresholds: IPC_7525_THRESHOLDS }).recommendedThicknessUm
		).toBeNull();
	});
	it('no apertures → null shares and null recommendation', () => {
		const s = thicknessSweep([], { thresholds: IPC_7525_THRESHOLDS, thicknessesUm: [100] });
		expect(s.series).toEqual([{ thicknessUm: 100, passing: 0, total: 0, passShare: null }]);
		expect(s.recommendedThicknessUm).toBeNull();
	});
	it('a foil exactly at the limit counts as passing (≥)', () => {
		// 264 µm square at 100 µm: AR = 0.66 exactly
		expect(
			thicknessSweep([rect(264, 264)], { thresholds: IPC_7525_THRESHOLDS, thicknessesUm: [100] })
				.series[0].passing
		).toBe(1);
	});
	it('bad thickness or share → clear error', () => {
		expect(() =>
			thicknessSweep([qfp], { thresholds: IPC_7525_THRESHOLDS, thicknessesUm: [100, -5] })
		).toThrow(/thickness sweep, thicknessesUm\[1\]: must be a finite number greater than 0/);
		expect(() =>
			thicknessSweep([qfp], { thresholds: IPC_7525_THRESHOLDS, requiredPassShare: 1.5 })
		).toThrow(/requiredPassShare: must be between 0 and 1/);
	});
});

describe('thicknessSweep with step regions: the base foil is swept, stepped apertures keep their thickness', () => {
	const stepped = examples.issueExamples.thicknessSweepWithStep;
	// QFP pad at the origin on the base foil; the 0201 pad at (20 mm, 2 mm) inside the step.
	const chipInStep = rect(300, 280, { refdes: 'C1', xUm: 20000, yUm: 2000 });
	const region = (thicknessUm: number) => [
		{ xMinUm: 15000, yMinUm: 0, xMaxUm: 25000, yMaxUm: 5000, thicknessUm }
	];
	const shares = (s: ReturnType<typeof thicknessSweep>) =>
		Object.fromEntries(s.series.map((p) => [String(p.thicknessUm), p.passShare]));

	it('a 100 µm step: the 0201 passes at every base foil, so 120 µm is recommended (100 µm without the step)', () => {
		const s = thicknessSweep([qfp, chipInStep], {
			thresholds: IPC_7525_THRESHOLDS,
			stepRegions: region(100)
		});
		expect(shares(s)).toEqual(stepped.stepAt100Um.passShareByThicknessUm);
		expect(s.recommendedThicknessUm).toBe(stepped.stepAt100Um.recommendedThicknessUmAllPass);
		expect(s.steppedApertures).toBe(1);
		const uniform = thicknessSweep([qfp, chipInStep], { thresholds: IPC_7525_THRESHOLDS });
		expect(uniform.recommendedThicknessUm).toBe(ex.recommendedThicknessUmAllPass);
		expect(uniform.steppedApertures).toBe(0);
	});

	it('a 120 µm step: the 0201 fails at every base foil, so no foil lets all pass', () => {
		const s = thicknessSweep([qfp, chipInStep], {
			thresholds: IPC_7525_THRESHOLDS,
			stepRegions: region(120)
		});
		expect(shares(s)).toEqual(stepped.stepAt120Um.passShareByThicknessUm);
		expect(s.recommendedThicknessUm).toBe(stepped.stepAt120Um.recommendedThicknessUmAllPass);
		expect(
			thicknessSweep([qfp, chipInStep], {
				thresholds: IPC_7525_THRESHOLDS,
				stepRegions: region(120),
				requiredPassShare: 0.5
			}).recommendedThicknessUm
		).toBe(stepped.stepAt120Um.recommendedThicknessUmHalfPass);
	});

	it('at the stencil’s own base foil the sweep counts exactly what evaluateStencil passes', () => {
		const apertures = Array.from({ length: 60 }, (_, i) =>
			i % 3 === 0
				? circle(200 + i * 5, { xUm: i * 1000, yUm: (i % 7) * 1000 })
				: rect(300 + i * 10, 180 + (i % 9) * 20, {
						xUm: i * 1000,
						yUm: (i % 7) * 1000,
						rotationDeg: (i * 11) % 360
					})
		);
		const stepRegions = [
			{ xMinUm: 0, yMinUm: 0, xMaxUm: 20000, yMaxUm: 7000, thicknessUm: 100 },
			{ xMinUm: 10000, yMinUm: 2000, xMaxUm: 30000, yMaxUm: 4000, thicknessUm: 150 }
		];
		for (const thicknessUm of [80, 127, 180]) {
			const evaluated = evaluateStencil(apertures, {
				thicknessUm,
				thresholds: IPC_7525_THRESHOLDS,
				stepRegions
			});
			const point = thicknessSweep(apertures, {
				thresholds: IPC_7525_THRESHOLDS,
				stepRegions,
				thicknessesUm: [thicknessUm]
			}).series[0];
			expect(point.passing).toBe(evaluated.filter((e) => e.status === 'pass').length);
		}
	});

	it('a bad step region is refused with its field', () =>
		expect(() =>
			thicknessSweep([qfp], {
				thresholds: IPC_7525_THRESHOLDS,
				stepRegions: [{ xMinUm: 0, yMinUm: 0, xMaxUm: -1, yMaxUm: 5, thicknessUm: 80 }]
			})
		).toThrow(/stepRegions\[0\], xMaxUm: must not be less than xMinUm/));
});
