import { describe, it, expect } from 'vitest';
import ref from '../../../reference/printlog/check-values.json';
import {
	NUMERIC_PARAMETERS,
	physicalRangeProblem,
	pressureWindowKg,
	squeegeePressureNewtons
} from './parameters';
import type { WindowedParameterKey } from './parameters';

describe('pressureWindowKg', () => {
	it('derives the 300 mm blade window from 0.15–0.35 N/mm and standard gravity', () => {
		// First principles (reference/printlog/check-values.json, computed in python float64).
		const expected = ref.pressureWindowKgFor300mmBlade;
		const window = pressureWindowKg(expected.bladeLengthMm);
		expect(window.min).toBeCloseTo(expected.min, 9);
		expect(window.target).toBeCloseTo(expected.target, 9);
		expect(window.max).toBeCloseTo(expected.max, 9);
	});

	it('brackets the older 1–1.5 lbf per inch guidance for the same blade', () => {
		// Independent route: lbf × inches of blade × 0.45359237 kg/lb (exact, 1959 agreement).
		const inches = 300 / ref.inchMm.value;
		const window = pressureWindowKg(300);
		for (const lbfPerInch of ref.olderPoundPerInchGuidance.lbfPerInch) {
			const kg = lbfPerInch * inches * ref.poundMassKg.value;
			expect(kg).toBeGreaterThanOrEqual(window.min);
			expect(kg).toBeLessThanOrEqual(window.max);
		}
		expect(1 * inches * ref.poundMassKg.value).toBeCloseTo(
			ref.olderPoundPerInchGuidance.kgFor300mmBlade[0],
			9
		);
	});

	it('scales linearly with blade length', () => {
		expect(pressureWindowKg(600).max).toBeCloseTo(2 * pressureWindowKg(300).max, 12);
	});

	it.each([[0], [-300], [Number.NaN], [Number.POSITIVE_INFINITY]])(
		'refuses blade length %s with a message naming the field',
		(length) => {
			expect(() => pressureWindowKg(length)).toThrow(/bladeLengthMm: must be a number > 0/);
		}
	);

	it('the catalogue default equals the derived 300 mm window', () => {
		expect(NUMERIC_PARAMETERS.squeegeePressureKg.defaultWindow).toEqual(pressureWindowKg(300));
	});
});

describe('squeegeePressureNewtons', () => {
	it('converts kg-force with standard gravity', () => {
		expect(squeegeePressureNewtons(ref.kgToNewtons5kg.kg)).toBeCloseTo(
			ref.kgToNewtons5kg.newtons,
			9
		);
	});
});

describe('default windows match the common-practice reference values', () => {
	const keys = Object.keys(ref.printWindows) as (keyof typeof ref.printWindows)[];
	it.each(keys)('%s', (key) => {
		const window = NUMERIC_PARAMETERS[key].defaultWindow;
		expect(window).not.toBeNull();
		expect(window?.min).toBe(ref.printWindows[key].min);
		expect(window?.max).toBe(ref.printWindows[key].max);
	});

	it('squeegee angle targets the usual 60°', () => {
		expect(NUMERIC_PARAMETERS.squeegeeAngleDeg.defaultWindow?.target).toBe(
			ref.printWindows.squeegeeAngleDeg.usual
		);
	});

	it('every default window is ordered and inside its physical range', () => {
		for (const spec of Object.values(NUMERIC_PARAMETERS)) {
			const w = spec.defaultWindow;
			if (!w) continue;
			expect(w.min, spec.key).toBeLessThanOrEqual(w.target);
			expect(w.target, spec.key).toBeLessThanOrEqual(w.max);
			for (const v of [w.min, w.target, w.max])
				expect(physicalRangeProblem(spec.key, v)).toBeNull();
		}
	});
});

describe('physicalRangeProblem', () => {
	const cases: [WindowedParameterKey, unknown, string | null][] = [
		['squeegeeAngleDeg', 90, null],
		['squeegeeAngleDeg', 90.1, 'must be ≤ 90° (got 90.1)'],
		['squeegeeAngleDeg', 0, 'must be > 0° (got 0)'],
		['squeegeeSpeedMmS', -5, 'must be > 0 mm/s (got -5)'],
		['squeegeeSpeedMmS', Number.NaN, 'must be a finite number (got NaN)'],
		['squeegeeSpeedMmS', undefined, 'must be a finite number (got missing)'],
		['squeegeeSpeedMmS', '40', 'must be a finite number (got "40")'],
		['printGapMm', 0, null],
		['printGapMm', -0.1, 'must be ≥ 0 mm (got -0.1)'],
		['wipeIntervalPrints', 0, null],
		['wipeIntervalPrints', 2.5, 'must be a whole number (got 2.5)'],
		['relativeHumidityPct', 100, null],
		['relativeHumidityPct', 101, 'must be ≤ 100% (got 101)'],
		['ambientTempC', -20, null],
		['ambientTempC', -21, 'must be ≥ -20 °C (got -21)']
	];
	it.each(cases)('%s = %s → %s', (key, value, expected) => {
		expect(physicalRangeProblem(key, value)).toBe(expected);
	});
});
