/**
 * Recipe windows and the check of a print run against them. A recipe (product × line) sets a
 * window (min, target, max) per numeric parameter and an expected value per categorical one;
 * a run outside a window, or with a different categorical value, is a deviation that the
 * technician must explain before the run is saved (the API answers 422 naming the parameter).
 */
import type { FieldError } from './field-error';
import { describeValue } from './field-error';
import {
	BLADE_TYPES,
	BOARD_SUPPORTS,
	CATEGORICAL_LABELS,
	NUMERIC_PARAMETERS,
	PRINT_STROKES,
	REQUIRED_RECIPE_PARAMETERS,
	isCategoricalParameterKey,
	isWindowedParameterKey,
	physicalRangeProblem
} from './parameters';
import type {
	AmbientParameterKey,
	CategoricalParameterKey,
	NumericWindow,
	WindowedParameterKey
} from './parameters';
import { parseWipeMode } from './wipe-mode';

/** Recipe parameters: a window per numeric key, an expected value per categorical key. */
export type RecipeParameters = Partial<Record<WindowedParameterKey, NumericWindow>> &
	Partial<Record<CategoricalParameterKey, string>>;

/** A print recipe for one product on one line (both referred to by code). */
export interface Recipe {
	product: string;
	line: string;
	parameters: RecipeParameters;
}

/** The values a run actually used: numbers for numeric keys, text for categorical ones. */
export type RunParameters = Partial<Record<WindowedParameterKey, number>> &
	Partial<Record<CategoricalParameterKey, string>>;

/** A numeric value outside its window. Ambient deviations are recorded but need no reason. */
export interface NumericDeviation {
	kind: 'numeric';
	parameter: WindowedParameterKey;
	value: number;
	min: number;
	max: number;
	target: number;
	requiresReason: boolean;
}

/** A categorical value different from the recipe's (compared after normalising spelling). */
export interface CategoricalDeviation {
	kind: 'categorical';
	parameter: CategoricalParameterKey;
	value: string;
	expected: string;
	requiresReason: boolean;
}

/** A deviation of a run from its recipe. */
export type Deviation = NumericDeviation | CategoricalDeviation;

/** Allowed values per categorical key other than wipe mode (which is a set, see wipe-mode.ts). */
const CATEGORY_VALUES: Readonly<
	Record<Exclude<CategoricalParameterKey, 'wipeMode'>, readonly string[]>
> = { printStroke: PRINT_STROKES, bladeType: BLADE_TYPES, boardSupport: BOARD_SUPPORTS };

const AMBIENT_KEYS: readonly string[] = ['ambientTempC', 'relativeHumidityPct'];

/**
 * Normalise a categorical value to its canonical form: trimmed lower case, and for wipe mode the
 * canonical step string. Accepts the plain value or `{ value }` (the recipe payload allows both).
 * @example normaliseCategorical('wipeMode', { value: 'dry+wet' }) // { ok: true, value: 'wet-dry' }
 */
export function normaliseCategorical(
	key: CategoricalParameterKey,
	raw: unknown,
	field = `parameters.${key}`
): { ok: true; value: string } | { ok: false; error: FieldError } {
	const wrapped = raw !== null && typeof raw === 'object' && 'value' in raw;
	const text = wrapped ? (raw as { value: unknown }).value : raw;
	if (key === 'wipeMode') {
		const parsed = parseWipeMode(text, field);
		return parsed.ok ? { ok: true, value: parsed.canonical } : parsed;
	}
	const allowed = CATEGORY_VALUES[key];
	const value = typeof text === 'string' ? text.trim().toLowerCase() : '';
	if (!allowed.includes(value)) {
		return {
			ok: false,
			error: { field, message: `must be one of ${allowed.join(', ')} (got ${describeValue(text)})` }
		};
	}
	return { ok: true, value };
}

/**
 * Validate one window: each of min, target and max within the parameter's physical range, and
 * min ≤ target ≤ max. Fields are reported as `<prefix>.min` etc.
 * @example validateWindow('squeegeeAngleDeg', { min: 45, target: 60, max: 55 })
 * // [{ field: 'parameters.squeegeeAngleDeg.max', message: 'must be ≥ target (60)' }]
 */
export function validateWindow(
	key: WindowedParameterKey,
	window: unknown,
	prefix = `parameters.${key}`
): FieldError[] {
	if (window === null || typeof window !== 'object') {
		const message = `must be a window { min, target, max } (got ${describeValue(window)})`;
		return [{ field: prefix, message }];
	}
	const w = window as Record<string, unknown>;
	const errors: FieldError[] = [];
	for (const edge of ['min', 'target', 'max'] as const) {
		const problem = physicalRangeProblem(key, w[edge]);
		if (problem) errors.push({ field: `${prefix}.${edge}`, message: problem });
	}
	if (errors.length > 0) return errors;
	const { min, target, max } = w as unknown as NumericWindow;
	if (target < min) {
		errors.push({ field: `${prefix}.target`, message: `must be ≥ min (${min})` });
	}
	if (max < target) {
		errors.push({ field: `${prefix}.max`, message: `must be ≥ target (${target})` });
	}
	return errors;
}

/**
 * Validate a recipe: product and line codes present, the required parameters windowed, every
 * window valid, every categorical value known, and no unknown parameter keys.
 * Required: squeegeeAngleDeg, squeegeeSpeedMmS, squeegeePressureKg, separationSpeedMmS.
 * @example validateRecipe({ product: 'BRD-100', line: 'L1', parameters: {} }).length // 4
 */
export function validateRecipe(recipe: {
	product?: unknown;
	line?: unknown;
	parameters?: unknown;
}): FieldError[] {
	const errors: FieldError[] = [];
	for (const field of ['product', 'line'] as const) {
		const value = recipe[field];
		if (typeof value !== 'string' || value.trim() === '') {
			errors.push({ field, message: `must be a non-blank code (got ${describeValue(value)})` });
		}
	}
	const parameters = recipe.parameters;
	if (parameters === null || typeof parameters !== 'object') {
		const message = `must be an object (got ${describeValue(parameters)})`;
		errors.push({ field: 'parameters', message });
		return errors;
	}
	const entries = parameters as Record<string, unknown>;
	for (const key of REQUIRED_RECIPE_PARAMETERS) {
		if (entries[key] === undefined) {
			errors.push({
				field: `parameters.${key}`,
				message: 'is required: give a window { min, target, max }'
			});
		}
	}
	for (const [key, value] of Object.entries(entries)) {
		if (value === undefined) continue;
		if (isWindowedParameterKey(key)) errors.push(...validateWindow(key, value));
		else if (isCategoricalParameterKey(key)) {
			const result = normaliseCategorical(key, value);
			if (!result.ok) errors.push(result.error);
		} else errors.push({ field: `parameters.${key}`, message: 'is not a known print parameter' });
	}
	return errors;
}

/** Field path of an actual value: ambient conditions sit at the top of the run payload. */
function actualField(key: string): string {
	return AMBIENT_KEYS.includes(key) ? key : `parameters.${key}`;
}

/**
 * Validate a run's actual values against physical ranges and known categories. A physically
 * impossible value (negative speed, angle above 90°) is an error, not a deviation.
 * @example validateRunParameters({ squeegeeSpeedMmS: -5 })
 * // [{ field: 'parameters.squeegeeSpeedMmS', message: 'must be > 0 mm/s (got -5)' }]
 */
export function validateRunParameters(actual: Record<string, unknown>): FieldError[] {
	const errors: FieldError[] = [];
	for (const [key, value] of Object.entries(actual)) {
		if (value === undefined) continue;
		if (isWindowedParameterKey(key)) {
			const problem = physicalRangeProblem(key, value);
			if (problem) errors.push({ field: actualField(key), message: problem });
		} else if (isCategoricalParameterKey(key)) {
			const result = normaliseCategorical(key, value);
			if (!result.ok) errors.push(result.error);
		} else errors.push({ field: `parameters.${key}`, message: 'is not a known print parameter' });
	}
	return errors;
}

/** True when `value` lies outside [min, max]; a value on an edge is inside. A relative
 * tolerance of 1e-9 keeps binary artefacts (4.589000000001) on the edge they were typed on. */
function isOutside(value: number, window: NumericWindow): boolean {
	const tolerance = (edge: number) => 1e-9 * Math.max(1, Math.abs(edge));
	return value < window.min - tolerance(window.min) || value > window.max + tolerance(window.max);
}

/**
 * Check a run's actual values against its recipe. Returns the deviations (numeric outside the
 * window, edges inside; categorical different from the recipe) and the errors (physically
 * impossible values, unknown keys, or a value the recipe windows but the run does not give).
 * Ambient conditions are checked against the recipe's ambient window when it has one, else the
 * catalogue default (20–26 °C, 30–60 % RH, common practice); they are recorded as deviations
 * with `requiresReason: false` because the technician cannot change the room.
 * @example
 * checkRunAgainstRecipe({ squeegeeAngleDeg: 65 }, { product: 'P', line: 'L', parameters: { squeegeeAngleDeg: { min: 45, target: 60, max: 60 } } })
 * // { deviations: [{ kind: 'numeric', parameter: 'squeegeeAngleDeg', value: 65, min: 45, max: 60, target: 60, requiresReason: true }], errors: [] }
 */
export function checkRunAgainstRecipe(
	actual: Record<string, unknown>,
	recipe: Recipe,
	options: { ambientWindows?: Partial<Record<AmbientParameterKey, NumericWindow>> } = {}
): { deviations: Deviation[]; errors: FieldError[] } {
	const errors = validateRunParameters(actual);
	const badFields = new Set(errors.map((e) => e.field));
	const deviations: Deviation[] = [];
	for (const [key, expected] of Object.entries(recipe.parameters)) {
		if (expected === undefined) continue;
		const value = actual[key];
		if (value === undefined) {
			if (!AMBIENT_KEYS.includes(key)) {
				errors.push({ field: actualField(key), message: 'is required: the recipe sets it' });
			}
			continue;
		}
		if (badFields.has(actualField(key))) continue;
		if (isWindowedParameterKey(key)) {
			const window = expected as NumericWindow;
			if (isOutside(value as number, window)) {
				deviations.push({
					kind: 'numeric',
					parameter: key,
					value: value as number,
					min: window.min,
					max: window.max,
					target: window.target,
					requiresReason: !AMBIENT_KEYS.includes(key)
				});
			}
		} else if (isCategoricalParameterKey(key)) {
			const want = normaliseCategorical(key, expected);
			const got = normaliseCategorical(key, value);
			if (want.ok && got.ok && want.value !== got.value) {
				deviations.push({
					kind: 'categorical',
					parameter: key,
					value: got.value,
					expected: want.value,
					requiresReason: true
				});
			}
		}
	}
	for (const key of AMBIENT_KEYS as AmbientParameterKey[]) {
		const value = actual[key];
		if (recipe.parameters[key] !== undefined || value === undefined) continue;
		if (badFields.has(key)) continue;
		const window = options.ambientWindows?.[key] ?? NUMERIC_PARAMETERS[key].defaultWindow;
		if (window && isOutside(value as number, window)) {
			deviations.push({
				kind: 'numeric',
				parameter: key,
				value: value as number,
				min: window.min,
				max: window.max,
				target: window.target,
				requiresReason: false
			});
		}
	}
	return { deviations, errors };
}

/**
 * The parameters whose deviation needs a reason but has none (missing, or only whitespace).
 * The print-run API answers 422 naming them.
 * @example missingDeviationReasons([angleDeviation], { squeegeeAngleDeg: '  ' }) // ['squeegeeAngleDeg']
 */
export function missingDeviationReasons(
	deviations: readonly Deviation[],
	reasons: Readonly<Record<string, string | undefined>> | undefined
): string[] {
	return deviations
		.filter((d) => d.requiresReason)
		.map((d) => d.parameter)
		.filter((parameter) => {
			const reason = reasons?.[parameter];
			return typeof reason !== 'string' || reason.trim() === '';
		});
}

/**
 * Describe a deviation in one line for the form and the 422 body.
 * @example describeDeviation({ kind: 'numeric', parameter: 'squeegeeAngleDeg', value: 65, min: 45, max: 60, target: 60, requiresReason: true })
 * // 'Squeegee angle 65° is outside the recipe window 45–60°'
 */
export function describeDeviation(deviation: Deviation): string {
	if (deviation.kind === 'categorical') {
		const label = CATEGORICAL_LABELS[deviation.parameter];
		return `${label} '${deviation.value}' differs from the recipe ('${deviation.expected}')`;
	}
	const spec = NUMERIC_PARAMETERS[deviation.parameter];
	const unit = spec.unit === '°' || spec.unit === '%' ? spec.unit : ` ${spec.unit}`;
	const show = (n: number) => n.toFixed(spec.decimals);
	const window = `${show(deviation.min)}–${show(deviation.max)}${unit}`;
	return `${spec.label} ${show(deviation.value)}${unit} is outside the recipe window ${window}`;
}

/**
 * Field errors for the deviations that lack a reason, in the module's one message format
 * (`deviationReasons.<parameter>: …`), ready for a 422 body.
 * @example deviationReasonErrors([angleDeviation], {})[0].field // 'deviationReasons.squeegeeAngleDeg'
 */
export function deviationReasonErrors(
	deviations: readonly Deviation[],
	reasons: Readonly<Record<string, string | undefined>> | undefined
): FieldError[] {
	const missing = new Set(missingDeviationReasons(deviations, reasons));
	return deviations
		.filter((d) => missing.has(d.parameter))
		.map((d) => ({
			field: `deviationReasons.${d.parameter}`,
			message: `a reason is required: ${describeDeviation(d)}`
		}));
}
