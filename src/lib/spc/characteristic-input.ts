import { z } from 'zod';
import { RULE_IDS } from './run-rules';
import { MEASURE_DEFAULTS, MEASURES, parameterUnit, type Measure } from './chart-measures';

const optionalNumber = z
	.union([z.number(), z.null()])
	.optional()
	.refine((v) => v == null || Number.isFinite(v), 'must be a finite number');

/** Pad selection of an SPI characteristic. */
export const padSelectionSchema = z.discriminatedUnion('kind', [
	z.object({ kind: z.literal('all') }),
	z.object({
		kind: z.literal('refdes'),
		refdes: z.array(z.string().trim().min(1).max(32)).min(1, 'give at least one refdes').max(500)
	}),
	z.object({ kind: z.literal('area-ratio'), min: optionalNumber, max: optionalNumber })
]);

/**
 * A characteristic as created or edited (form or API). Cross-field checks (LSL < USL, a
 * parameter key for print parameters, chart and subgroup agreeing) are in `checkCharacteristic`.
 */
export const characteristicInputSchema = z.object({
	name: z.string().trim().min(1, 'give the chart a name').max(120),
	productId: z.number().int().positive('choose a product'),
	lineIds: z.array(z.number().int().positive()).max(50).default([]),
	measure: z.enum(MEASURES, { error: `must be one of: ${MEASURES.join(', ')}` }),
	parameterKey: z.string().trim().max(64).nullish(),
	padSelection: padSelectionSchema.default({ kind: 'all' }),
	subgroupMode: z.enum(['board', 'consecutive']).default('board'),
	subgroupSize: z.number().int().min(1).max(25).default(1),
	chartKind: z.enum(['xbar-r', 'xbar-s', 'i-mr', 'between-within']),
	lsl: optionalNumber,
	target: optionalNumber,
	usl: optionalNumber,
	unit: z.string().trim().max(20).optional(),
	rules: z.array(z.enum(RULE_IDS)).default(['we-1', 'we-2', 'we-3', 'we-4'])
});
export type CharacteristicInput = z.infer<typeof characteristicInputSchema>;

/** One cross-field problem, in the shared `{ field, message }` shape. */
export type InputProblem = { field: string; message: string };

/**
 * Checks across fields of a characteristic.
 * @example checkCharacteristic({ ...input, lsl: 5, usl: 1 }) // [{ field: 'lsl', … }]
 */
export function checkCharacteristic(
	input: CharacteristicInput,
	parameterKeys: readonly string[]
): InputProblem[] {
	const out: InputProblem[] = [];
	if (input.lsl != null && input.usl != null && input.lsl >= input.usl) {
		out.push({ field: 'lsl', message: `LSL ${input.lsl} must be below USL ${input.usl}` });
	}
	if (input.measure === 'print-parameter') {
		if (!input.parameterKey || !parameterKeys.includes(input.parameterKey)) {
			out.push({
				field: 'parameterKey',
				message: `choose one of: ${parameterKeys.join(', ')}`
			});
		}
		if (input.chartKind === 'between-within') {
			out.push({ field: 'chartKind', message: 'between/within needs SPI pads; use I-MR or X̄/R' });
		}
	}
	if (input.measure === 'transfer-efficiency-pct' && input.padSelection.kind !== 'all') {
		out.push({
			field: 'padSelection',
			message: 'transfer efficiency is charted for all pads only (from the board aggregates)'
		});
	}
	const perPoint = input.subgroupMode === 'consecutive' ? input.subgroupSize : 1;
	if (input.measure === 'print-parameter' || input.subgroupMode === 'consecutive') {
		if (input.chartKind === 'i-mr' && perPoint !== 1) {
			out.push({ field: 'subgroupSize', message: 'I-MR charts one value per point: use size 1' });
		}
		if (input.chartKind === 'xbar-r' && (perPoint < 2 || perPoint > 10)) {
			out.push({ field: 'subgroupSize', message: 'X̄/R needs subgroups of 2 to 10' });
		}
		if (input.chartKind === 'xbar-s' && perPoint < 2) {
			out.push({ field: 'subgroupSize', message: 'X̄/S needs subgroups of at least 2' });
		}
	}
	return out;
}

/** Which pads feed an SPI characteristic, as stored (open area-ratio bounds are null). */
export type StoredPadSelection =
	| { kind: 'all' }
	| { kind: 'refdes'; refdes: string[] }
	| { kind: 'area-ratio'; min: number | null; max: number | null };

function storedPadSelection(p: CharacteristicInput['padSelection']): StoredPadSelection {
	if (p.kind === 'area-ratio')
		return { kind: 'area-ratio', min: p.min ?? null, max: p.max ?? null };
	return p;
}

/** The unit a characteristic is charted in: as given, else the parameter's or the measure's. */
export function characteristicUnit(input: CharacteristicInput): string {
	if (input.unit) return input.unit;
	if (input.measure === 'print-parameter') return parameterUnit(input.parameterKey ?? '');
	return MEASURE_DEFAULTS[input.measure as Measure].unit;
}

/**
 * The stored settings of a valid characteristic: specs not given at all take the measure's
 * defaults (an explicit null clears them), lines and rules without repeats, one value per point
 * unless subgroups are consecutive.
 * @example characteristicValues({ ...input, measure: 'volume-pct', lsl: undefined }).lsl // the default LSL
 */
export function characteristicValues(input: CharacteristicInput) {
	const defaults = MEASURE_DEFAULTS[input.measure as Measure];
	const spec = (v: number | null | undefined, d: number | null) => (v === undefined ? d : v);
	return {
		name: input.name,
		productId: input.productId,
		lineIds: [...new Set(input.lineIds)].sort((a, b) => a - b),
		measure: input.measure,
		parameterKey: input.measure === 'print-parameter' ? (input.parameterKey ?? null) : null,
		padSelection: storedPadSelection(input.padSelection),
		subgroupMode: input.subgroupMode,
		subgroupSize: input.subgroupMode === 'consecutive' ? input.subgroupSize : 1,
		chartKind: input.chartKind,
		lsl: spec(input.lsl, defaults.lsl),
		target: spec(input.target, defaults.target),
		usl: spec(input.usl, defaults.usl),
		unit: characteristicUnit(input),
		rules: [...new Set(input.rules)]
	};
}
