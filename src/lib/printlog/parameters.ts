/**
 * The print parameter catalogue: every numeric parameter a print run records, with its physical
 * range (hard validation: outside it the value cannot be real) and its default recipe window
 * (soft: outside it the run is a deviation that needs a reason).
 *
 * Default windows are common practice, not standards (REFERENCE-FACTS §e "Print parameter
 * windows"; check the paste data sheet). Physical ranges above the obvious bounds (0, 90°, 100 %)
 * are Rollbead plausibility limits chosen to catch typing slips such as 400 for 40 mm/s.
 * Every value and its source is listed in reference/printlog/defaults.md.
 */
import { kgToNewtons, STANDARD_GRAVITY } from '../units/index';
import { describeValue } from './field-error';

/** Keys of the numeric print parameters a recipe windows and a run records. */
export const NUMERIC_PARAMETER_KEYS = [
	'squeegeeAngleDeg',
	'squeegeeSpeedMmS',
	'squeegeePressureKg',
	'separationSpeedMmS',
	'separationDistanceMm',
	'printGapMm',
	'bladeLengthMm',
	'wipeIntervalPrints'
] as const;

/** Keys of the ambient conditions logged with a run (windowed, but not set on the printer). */
export const AMBIENT_PARAMETER_KEYS = ['ambientTempC', 'relativeHumidityPct'] as const;

/** A numeric print parameter key, e.g. `squeegeeSpeedMmS`. */
export type NumericParameterKey = (typeof NUMERIC_PARAMETER_KEYS)[number];
/** An ambient condition key: `ambientTempC` or `relativeHumidityPct`. */
export type AmbientParameterKey = (typeof AMBIENT_PARAMETER_KEYS)[number];
/** Any key with a numeric window: print parameter or ambient condition. */
export type WindowedParameterKey = NumericParameterKey | AmbientParameterKey;

/** A recipe window: a value `v` is inside when `min ≤ v ≤ max` (edges inside). */
export interface NumericWindow {
	min: number;
	target: number;
	max: number;
}

/** Hard bounds; `minExclusive`: the minimum itself is impossible (a speed of 0 prints nothing). */
export interface PhysicalRange {
	min: number;
	max: number;
	minExclusive?: boolean;
}

/** Catalogue entry for one numeric parameter. */
export interface NumericParameterSpec {
	key: WindowedParameterKey;
	label: string;
	/** Display unit, e.g. `mm/s`. */
	unit: string;
	physical: PhysicalRange;
	/** Whole numbers only (a print count). */
	integer: boolean;
	/** Default recipe window, or null where common practice gives none (set per recipe). */
	defaultWindow: NumericWindow | null;
	/** Decimals to show in tables and forms. */
	decimals: number;
	/** Where the default window comes from. */
	source: string;
}

/** Squeegee load per mm of blade length, N/mm (REFERENCE-FACTS §e, common practice). */
export const PRESSURE_N_PER_MM = { min: 0.15, target: 0.25, max: 0.35 } as const;

/** Blade length the catalogue's default pressure window assumes, mm (Rollbead choice). */
export const DEFAULT_BLADE_LENGTH_MM = 300;

/**
 * Default squeegee pressure window in kg for a blade length: the common-practice load of
 * 0.15–0.35 N per mm of blade (target 0.25 N/mm, the mid-point, a Rollbead choice) times the
 * length, divided by standard gravity because printers display load as kg.
 * @throws {RangeError} when the blade length is not a positive finite number.
 * @example pressureWindowKg(300) // { min: 4.589…, target: 7.647…, max: 10.707… }
 */
export function pressureWindowKg(bladeLengthMm: number): NumericWindow {
	if (!Number.isFinite(bladeLengthMm) || bladeLengthMm <= 0) {
		throw new RangeError(`bladeLengthMm: must be a number > 0 (got ${bladeLengthMm})`);
	}
	const kg = (nPerMm: number) => (nPerMm * bladeLengthMm) / STANDARD_GRAVITY;
	return {
		min: kg(PRESSURE_N_PER_MM.min),
		target: kg(PRESSURE_N_PER_MM.target),
		max: kg(PRESSURE_N_PER_MM.max)
	};
}

/**
 * Squeegee pressure in newtons for display beside the kg the printer shows.
 * @example squeegeePressureNewtons(5) // 49.03325
 */
export function squeegeePressureNewtons(pressureKg: number): number {
	return kgToNewtons(pressureKg);
}

const COMMON = 'common practice (REFERENCE-FACTS §e)';

/** The numeric parameter catalogue, keyed by parameter. */
export const NUMERIC_PARAMETERS: Readonly<Record<WindowedParameterKey, NumericParameterSpec>> = {
	squeegeeAngleDeg: {
		key: 'squeegeeAngleDeg',
		label: 'Squeegee angle',
		unit: '°',
		physical: { min: 0, max: 90, minExclusive: true },
		integer: false,
		defaultWindow: { min: 45, target: 60, max: 60 },
		decimals: 0,
		source: COMMON
	},
	squeegeeSpeedMmS: {
		key: 'squeegeeSpeedMmS',
		label: 'Squeegee speed',
		unit: 'mm/s',
		physical: { min: 0, max: 500, minExclusive: true },
		integer: false,
		defaultWindow: { min: 20, target: 40, max: 100 },
		decimals: 0,
		source: `${COMMON}; target 40 a Rollbead choice`
	},
	squeegeePressureKg: {
		key: 'squeegeePressureKg',
		label: 'Squeegee pressure',
		unit: 'kg',
		physical: { min: 0, max: 50, minExclusive: true },
		integer: false,
		defaultWindow: pressureWindowKg(DEFAULT_BLADE_LENGTH_MM),
		decimals: 1,
		source: `${COMMON}: 0.15–0.35 N/mm × ${DEFAULT_BLADE_LENGTH_MM} mm blade ÷ g`
	},
	separationSpeedMmS: {
		key: 'separationSpeedMmS',
		label: 'Separation speed',
		unit: 'mm/s',
		physical: { min: 0, max: 100, minExclusive: true },
		integer: false,
		defaultWindow: { min: 0.5, target: 1, max: 3 },
		decimals: 1,
		source: `${COMMON}; target 1 a Rollbead choice`
	},
	separationDistanceMm: {
		key: 'separationDistanceMm',
		label: 'Separation distance',
		unit: 'mm',
		physical: { min: 0, max: 20 },
		integer: false,
		defaultWindow: null,
		decimals: 1,
		source: 'no sourced default: set per recipe'
	},
	printGapMm: {
		key: 'printGapMm',
		label: 'Print gap (0 = on contact)',
		unit: 'mm',
		physical: { min: 0, max: 5 },
		integer: false,
		defaultWindow: { min: 0, target: 0, max: 0 },
		decimals: 2,
		source: `${COMMON}: on-contact printing`
	},
	bladeLengthMm: {
		key: 'bladeLengthMm',
		label: 'Blade length',
		unit: 'mm',
		physical: { min: 0, max: 1000, minExclusive: true },
		integer: false,
		defaultWindow: null,
		decimals: 0,
		source: 'machine set-up: set per recipe'
	},
	wipeIntervalPrints: {
		key: 'wipeIntervalPrints',
		label: 'Under-stencil wipe every',
		unit: 'prints',
		// 0 = automatic wiping switched off; it is a real setting, so it is physical but outside the window.
		physical: { min: 0, max: 1000 },
		integer: true,
		defaultWindow: { min: 1, target: 5, max: 10 },
		decimals: 0,
		source: `${COMMON}; target 5 a Rollbead choice`
	},
	ambientTempC: {
		key: 'ambientTempC',
		label: 'Ambient temperature',
		unit: '°C',
		physical: { min: -20, max: 60 },
		integer: false,
		defaultWindow: { min: 20, target: 23, max: 26 },
		decimals: 1,
		source: `${COMMON}; target 23 the mid-point`
	},
	relativeHumidityPct: {
		key: 'relativeHumidityPct',
		label: 'Relative humidity',
		unit: '%',
		physical: { min: 0, max: 100 },
		integer: false,
		defaultWindow: { min: 30, target: 45, max: 60 },
		decimals: 0,
		source: `${COMMON}; target 45 the mid-point`
	}
};

/** Parameters every recipe must window (the minimum set). */
export const REQUIRED_RECIPE_PARAMETERS: readonly NumericParameterKey[] = [
	'squeegeeAngleDeg',
	'squeegeeSpeedMmS',
	'squeegeePressureKg',
	'separationSpeedMmS'
];

/** Squeegee stroke direction. */
export const PRINT_STROKES = ['front-to-back', 'back-to-front', 'alternating'] as const;
/** Squeegee blade material. */
export const BLADE_TYPES = ['metal', 'polyurethane'] as const;
/** How the board is supported under the stencil. */
export const BOARD_SUPPORTS = [
	'pins',
	'blocks',
	'vacuum-fixture',
	'dedicated-tooling',
	'none'
] as const;

/** A squeegee stroke direction. */
export type PrintStroke = (typeof PRINT_STROKES)[number];
/** A squeegee blade material. */
export type BladeType = (typeof BLADE_TYPES)[number];
/** A board support method. */
export type BoardSupport = (typeof BOARD_SUPPORTS)[number];

/** Keys of the categorical parameters (wipe mode has its own module, see wipe-mode.ts). */
export const CATEGORICAL_PARAMETER_KEYS = [
	'printStroke',
	'bladeType',
	'wipeMode',
	'boardSupport'
] as const;
/** A categorical parameter key. */
export type CategoricalParameterKey = (typeof CATEGORICAL_PARAMETER_KEYS)[number];

/** Labels for the categorical parameters, for forms and messages. */
export const CATEGORICAL_LABELS: Readonly<Record<CategoricalParameterKey, string>> = {
	printStroke: 'Print stroke',
	bladeType: 'Blade type',
	wipeMode: 'Wipe mode',
	boardSupport: 'Board support'
};

/**
 * True when the key names a numeric print parameter or ambient condition.
 * @example isWindowedParameterKey('squeegeeSpeedMmS') // true
 */
export function isWindowedParameterKey(key: string): key is WindowedParameterKey {
	return Object.hasOwn(NUMERIC_PARAMETERS, key);
}

/**
 * True when the key names a categorical parameter.
 * @example isCategoricalParameterKey('printStroke') // true
 */
export function isCategoricalParameterKey(key: string): key is CategoricalParameterKey {
	return (CATEGORICAL_PARAMETER_KEYS as readonly string[]).includes(key);
}

/**
 * Check a value against a parameter's physical range. Used for both recipe windows and the
 * actual values of a run. Returns the problem in words, or null when the value is possible.
 * @example physicalRangeProblem('squeegeeAngleDeg', 95) // 'must be ≤ 90° (got 95)'
 */
export function physicalRangeProblem(key: WindowedParameterKey, value: unknown): string | null {
	const spec = NUMERIC_PARAMETERS[key];
	const { min, max, minExclusive } = spec.physical;
	const unit = spec.unit === '°' || spec.unit === '%' ? spec.unit : ` ${spec.unit}`;
	if (typeof value !== 'number' || !Number.isFinite(value)) {
		return `must be a finite number (got ${describeValue(value)})`;
	}
	if (minExclusive ? value <= min : value < min) {
		return `must be ${minExclusive ? '>' : '≥'} ${min}${unit} (got ${value})`;
	}
	if (value > max) return `must be ≤ ${max}${unit} (got ${value})`;
	if (spec.integer && !Number.isInteger(value)) return `must be a whole number (got ${value})`;
	return null;
}
