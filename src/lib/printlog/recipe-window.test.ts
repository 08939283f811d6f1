import { describe, it, expect } from 'vitest';
import {
	checkRunAgainstRecipe,
	describeDeviation,
	deviationReasonErrors,
	missingDeviationReasons,
	normaliseCategorical,
	validateRecipe,
	validateRunParameters,
	validateWindow
} from './recipe-window';
import type { Deviation, Recipe } from './recipe-window';
import { formatFieldError } from './field-error';

/** Fictional recipe: board BRD-100 on line L1, windows from the common-practice defaults. */
const recipe: Recipe = Object.freeze({
	product: 'BRD-100',
	line: 'L1',
	parameters: Object.freeze({
		squeegeeAngleDeg: { min: 45, target: 60, max: 60 },
		squeegeeSpeedMmS: { min: 20, target: 40, max: 100 },
		squeegeePressureKg: { min: 4.6, target: 7.6, max: 10.7 },
		separationSpeedMmS: { min: 0.5, target: 1, max: 3 },
		printStroke: 'alternating',
		wipeMode: 'wet-vacuum-dry'
	})
}) as Recipe;

const onTarget = {
	squeegeeAngleDeg: 60,
	squeegeeSpeedMmS: 40,
	squeegeePressureKg: 7.6,
	separationSpeedMmS: 1,
	printStroke: 'alternating',
	wipeMode: 'wet-vacuum-dry'
};

describe('validateWindow', () => {
	const cases: [string, unknown, string[]][] = [
		['ordered', { min: 45, target: 60, max: 60 }, []],
		['all equal', { min: 60, target: 60, max: 60 }, []],
		[
			'max below target',
			{ min: 45, target: 60, max: 55 },
			['parameters.squeegeeAngleDeg.max: must be ≥ target (60)']
		],
		[
			'target below min',
			{ min: 50, target: 45, max: 60 },
			['parameters.squeegeeAngleDeg.target: must be ≥ min (50)']
		],
		[
			'max above 90°',
			{ min: 45, target: 60, max: 95 },
			['parameters.squeegeeAngleDeg.max: must be ≤ 90° (got 95)']
		],
		[
			'NaN min',
			{ min: Number.NaN, target: 60, max: 60 },
			['parameters.squeegeeAngleDeg.min: must be a finite number (got NaN)']
		],
		[
			'missing target',
			{ min: 45, max: 60 },
			['parameters.squeegeeAngleDeg.target: must be a finite number (got missing)']
		],
		[
			'not an object',
			60,
			['parameters.squeegeeAngleDeg: must be a window { min, target, max } (got 60)']
		]
	];
	it.each(cases)('%s', (_name, window, expected) => {
		expect(validateWindow('squeegeeAngleDeg', window).map(formatFieldError)).toEqual(expected);
	});
});

describe('validateRecipe', () => {
	it('accepts a complete recipe', () => {
		expect(validateRecipe(recipe)).toEqual([]);
	});

	it('names every missing required parameter and blank code', () => {
		const errors = validateRecipe({ product: ' ', line: 'L1', parameters: {} }).map(
			formatFieldError
		);
		expect(errors).toEqual([
			'product: must be a non-blank code (got " ")',
			'parameters.squeegeeAngleDeg: is required: give a window { min, target, max }',
			'parameters.squeegeeSpeedMmS: is required: give a window { min, target, max }',
			'parameters.squeegeePressureKg: is required: give a window { min, target, max }',
			'parameters.separationSpeedMmS: is required: give a window { min, target, max }'
		]);
	});

	it('refuses unknown keys and categories; accepts { value } for categoricals', () => {
		const errors = validateRecipe({
			...recipe,
			parameters: {
				...recipe.parameters,
				squeegeeColour: 'red',
				bladeType: { value: 'Metal' },
				printStroke: 'sideways'
			}
		}).map(formatFieldError);
		expect(errors).toEqual([
			'parameters.printStroke: must be one of front-to-back, back-to-front, alternating (got "sideways")',
			'parameters.squeegeeColour: is not a known print parameter'
		]);
	});

	it('survives a missing parameters object', () => {
		expect(validateRecipe({ product: 'P', line: 'L' }).map(formatFieldError)).toEqual([
			'parameters: must be an object (got missing)'
		]);
	});
});

describe('checkRunAgainstRecipe: numeric windows, edges inside', () => {
	const cases: [number, boolean][] = [
		[44.999, true],
		[45, false],
		[52.5, false],
		[60, false],
		[60.001, true],
		[90, true]
	];
	it.each(cases)('angle %s° → deviation %s', (angle, deviates) => {
		const { deviations, errors } = checkRunAgainstRecipe(
			{ ...onTarget, squeegeeAngleDeg: angle },
			recipe
		);
		expect(errors).toEqual([]);
		expect(deviations).toEqual(
			deviates
				? [
						{
							kind: 'numeric',
							parameter: 'squeegeeAngleDeg',
							value: angle,
							min: 45,
							max: 60,
							target: 60,
							requiresReason: true
						}
					]
				: []
		);
	});

	it('keeps a value typed as the edge on the edge despite binary rounding', () => {
		// 0.1 + 0.2 = 0.30000000000000004 in float64; a window edge at 0.3 must still hold it.
		const r: Recipe = {
			...recipe,
			parameters: { ...recipe.parameters, printGapMm: { min: 0, target: 0, max: 0.3 } }
		};
		const { deviations } = checkRunAgainstRecipe({ ...onTarget, printGapMm: 0.1 + 0.2 }, r);
		expect(deviations).toEqual([]);
	});
});

describe('checkRunAgainstRecipe: categorical and errors', () => {
	it('reports a stroke differing from the recipe with expected', () => {
		const { deviations } = checkRunAgainstRecipe(
			{ ...onTarget, printStroke: 'Front-to-Back' },
			recipe
		);
		expect(deviations).toEqual([
			{
				kind: 'categorical',
				parameter: 'printStroke',
				value: 'front-to-back',
				expected: 'alternating',
				requiresReason: true
			}
		]);
	});

	it('treats wipe modes as sets (dry-vacuum-wet = wet-vacuum-dry)', () => {
		expect(
			checkRunAgainstRecipe({ ...onTarget, wipeMode: 'dry-vacuum-wet' }, recipe).deviations
		).toEqual([]);
		expect(
			checkRunAgainstRecipe({ ...onTarget, wipeMode: 'dry' }, recipe).deviations
		).toMatchObject([{ parameter: 'wipeMode', value: 'dry', expected: 'wet-vacuum-dry' }]);
	});

	it('returns physical-range errors, not deviations, for impossible values', () => {
		const result = checkRunAgainstRecipe(
			{ ...onTarget, squeegeeSpeedMmS: -40, ambientTempC: 80 },
			recipe
		);
		expect(result.deviations).toEqual([]);
		expect(result.errors.map(formatFieldError)).toEqual([
			'parameters.squeegeeSpeedMmS: must be > 0 mm/s (got -40)',
			'ambientTempC: must be ≤ 60 °C (got 80)'
		]);
	});

	it('requires the values the recipe sets', () => {
		const { squeegeeAngleDeg: _omit, ...rest } = onTarget;
		expect(checkRunAgainstRecipe(rest, recipe).errors.map(formatFieldError)).toEqual([
			'parameters.squeegeeAngleDeg: is required: the recipe sets it'
		]);
	});

	it('checks ambient against the default window, needing no reason', () => {
		const cases: [number, number, number][] = [
			[20, 30, 0],
			[26, 60, 0],
			[19.9, 45, 1],
			[23, 60.5, 1],
			[27, 65, 2]
		];
		for (const [t, rh, n] of cases) {
			const { deviations } = checkRunAgainstRecipe(
				{ ...onTarget, ambientTempC: t, relativeHumidityPct: rh },
				recipe
			);
			expect(deviations, `${t} °C ${rh} %`).toHaveLength(n);
			expect(deviations.every((d) => !d.requiresReason)).toBe(true);
		}
	});

	it('does not mutate its inputs', () => {
		const actual = Object.freeze({ ...onTarget, squeegeeAngleDeg: 70 });
		expect(() => checkRunAgainstRecipe(actual, recipe)).not.toThrow();
	});
});

describe('missingDeviationReasons', () => {
	const angle: Deviation = {
		kind: 'numeric',
		parameter: 'squeegeeAngleDeg',
		value: 65,
		min: 45,
		max: 60,
		target: 60,
		requiresReason: true
	};
	const stroke: Deviation = {
		kind: 'categorical',
		parameter: 'printStroke',
		value: 'front-to-back',
		expected: 'alternating',
		requiresReason: true
	};
	const humidity: Deviation = {
		kind: 'numeric',
		parameter: 'relativeHumidityPct',
		value: 70,
		min: 30,
		max: 60,
		target: 45,
		requiresReason: false
	};
	const cases: [string, Deviation[], Record<string, string> | undefined, string[]][] = [
		['no deviations', [], undefined, []],
		['no reasons object', [angle], undefined, ['squeegeeAngleDeg']],
		['blank reason', [angle], { squeegeeAngleDeg: ' \t' }, ['squeegeeAngleDeg']],
		['reason given', [angle], { squeegeeAngleDeg: 'new blade' }, []],
		['one of two', [angle, stroke], { printStroke: 'trial' }, ['squeegeeAngleDeg']],
		['ambient needs none', [humidity], {}, []]
	];
	it.each(cases)('%s', (_name, deviations, reasons, expected) => {
		expect(missingDeviationReasons(deviations, reasons)).toEqual(expected);
	});

	it('deviationReasonErrors words the 422 body', () => {
		expect(deviationReasonErrors([angle, stroke], {}).map(formatFieldError)).toEqual([
			'deviationReasons.squeegeeAngleDeg: a reason is required: Squeegee angle 65° is outside the recipe window 45–60°',
			"deviationReasons.printStroke: a reason is required: Print stroke 'front-to-back' differs from the recipe ('alternating')"
		]);
		expect(describeDeviation(humidity)).toBe(
			'Relative humidity 70% is outside the recipe window 30–60%'
		);
	});
});

describe('validateRunParameters and normaliseCategorical', () => {
	it('flags unknown keys and bad categories', () => {
		expect(validateRunParameters({ foo: 1, boardSupport: 'magic' }).map(formatFieldError)).toEqual([
			'parameters.foo: is not a known print parameter',
			'parameters.boardSupport: must be one of pins, blocks, vacuum-fixture, dedicated-tooling, none (got "magic")'
		]);
	});
	it('normalises case and the { value } form', () => {
		expect(normaliseCategorical('bladeType', { value: ' Polyurethane ' })).toEqual({
			ok: true,
			value: 'polyurethane'
		});
	});
});
