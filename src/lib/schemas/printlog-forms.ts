/**
 * Zod schemas for the print-log requests beyond the core payloads in ./printlog: ending and
 * correcting runs, stencil life entries and the run list filters. Client-safe.
 */
import { z } from 'zod';
import { STENCIL_STATES } from '../printlog/stencil-life';
import { boardSerialSchema, printRunSchema } from './printlog';
import {
	AMBIENT_PARAMETER_KEYS,
	CATEGORICAL_PARAMETER_KEYS,
	NUMERIC_PARAMETER_KEYS
} from '../printlog/parameters';
import type { FieldError } from '../printlog/field-error';

const instant = z.iso.datetime({
	offset: true,
	error: 'must be an ISO 8601 date-time with a time zone, e.g. 2026-03-02T08:00:00Z'
});
const boards = z
	.number()
	.int('must be a whole number')
	.min(0, 'must be ≥ 0')
	.max(1_000_000, 'must be ≤ 1000000');
const note = z.string().trim().max(500, 'must be at most 500 characters');

/** `POST /api/print-runs/{id}/end`: both optional (end now, keep the board count). */
export const endRunSchema = z.strictObject({
	endedAt: instant.optional(),
	boardsPrinted: boards.optional()
});

/**
 * `POST /api/print-runs/{id}/corrections`: the reason and the fields that change. Absent fields
 * keep their value; `null` clears an optional one (blade, board serial, ambient values, end).
 * Parameters are merged key by key into the recorded ones.
 */
export const correctRunSchema = z.strictObject({
	reason: z.string().trim().min(1, 'say why the run is corrected').max(500),
	stencil: printRunSchema.shape.stencil.optional(),
	pasteLot: printRunSchema.shape.pasteLot.optional(),
	boardSerial: boardSerialSchema.nullable().optional(),
	parameters: printRunSchema.shape.parameters.optional(),
	deviationReasons: printRunSchema.shape.deviationReasons,
	ambientTempC: printRunSchema.shape.ambientTempC.nullable(),
	relativeHumidityPct: printRunSchema.shape.relativeHumidityPct.nullable(),
	boardsPrinted: boards.optional(),
	startedAt: instant.optional(),
	endedAt: instant.nullable().optional(),
	bladeCode: z.string().trim().max(64).nullable().optional()
});

/** A stencil state change. */
export const stencilStateSchema = z.object({
	toState: z.enum(STENCIL_STATES, { error: `must be one of ${STENCIL_STATES.join(', ')}` }),
	note: note.default('')
});

/** Tension readings typed as a list: "38, 36.5 37" (N/cm). */
export const tensionFormSchema = z.object({
	readings: z
		.string()
		.trim()
		.min(1, 'give at least one reading in N/cm')
		.max(500)
		.refine((text) => parseReadings(text).every(Number.isFinite), {
			message: 'readings must be numbers in N/cm separated by commas or spaces, e.g. 38, 36.5, 37'
		}),
	note: note.default('')
});

/** Split a typed list of readings (comma, semicolon or space separated). */
export function parseReadings(text: string): number[] {
	return text
		.split(/[\s,;]+/)
		.filter((part) => part !== '')
		.map(Number);
}

/** A cleaning or inspection entry. */
export const stencilCareSchema = z.object({
	kind: z.enum(['cleaning', 'inspection']),
	detail: z.string().trim().min(1, 'is required').max(200),
	note: note.default('')
});

/** `at` of a life-log entry: an instant with a zone, not in the future (5 min clock slack). */
const entryAt = instant
	.refine((text) => Date.parse(text) <= Date.now() + 5 * 60_000, {
		message: 'must not be in the future'
	})
	.optional();

/**
 * `POST /api/stencil-life/{id}/entries`: one life-log entry, its shape chosen by `kind` —
 * `state` `{ toState, note? }`, `tension` `{ readingsNPerCm: [N/cm…], note? }`, `cleaning` /
 * `inspection` `{ detail, note? }`; every kind takes `at?` (default now).
 */
export const stencilLifeEntrySchema = z.discriminatedUnion(
	'kind',
	[
		z.strictObject({
			kind: z.literal('state'),
			toState: stencilStateSchema.shape.toState,
			note: note.optional(),
			at: entryAt
		}),
		z.strictObject({
			kind: z.literal('tension'),
			readingsNPerCm: z
				.array(z.number({ error: 'must be a number in N/cm' }), {
					error: 'must be a list of readings in N/cm, e.g. [38, 36.5, 37]'
				})
				.min(1, 'give at least one reading in N/cm')
				.max(50, 'at most 50 readings per entry'),
			note: note.optional(),
			at: entryAt
		}),
		z.strictObject({
			kind: z.enum(['cleaning', 'inspection']),
			detail: z
				.string({ error: 'is required: the cleaning method or the inspection result' })
				.trim()
				.min(1, 'is required: the cleaning method or the inspection result')
				.max(200, 'must be at most 200 characters'),
			note: note.optional(),
			at: entryAt
		})
	],
	{ error: 'kind must be one of state, tension, cleaning, inspection' }
);

/** Parsed life-log entry. */
export type StencilLifeEntryPayload = z.output<typeof stencilLifeEntrySchema>;

/** A date filter: an ISO date (`2026-03-02`) or date-time with a zone. */
const dateFilter = z
	.string()
	.trim()
	.refine(
		(text) =>
			/^\d{4}-\d{2}-\d{2}$/.test(text) || z.iso.datetime({ offset: true }).safeParse(text).success,
		{
			message: 'must be an ISO date (2026-03-02) or date-time with a zone'
		}
	);

/** Query of `GET /api/print-runs` and the run list page. Blank values mean "any". */
export const runFiltersSchema = z.object({
	line: z.string().trim().max(64).optional(),
	product: z.string().trim().max(64).optional(),
	stencil: z.string().trim().max(64).optional(),
	lot: z.string().trim().max(64).optional(),
	from: dateFilter.optional(),
	to: dateFilter.optional(),
	open: z.enum(['true', 'false']).optional(),
	limit: z.coerce.number().int().min(1).max(5000).optional()
});

/** Parsed run filters as dates: a bare `to` date includes that whole day (UTC). */
export function runFilterDates(filters: { from?: string; to?: string }): {
	from?: Date;
	to?: Date;
} {
	const day = /^\d{4}-\d{2}-\d{2}$/;
	const from = filters.from ? new Date(Date.parse(filters.from)) : undefined;
	let to = filters.to ? new Date(Date.parse(filters.to)) : undefined;
	if (to && day.test(filters.to!)) to = new Date(to.getTime() + 86_400_000 - 1);
	return { from, to };
}
// ---- The run form: flat fields so it posts as a plain HTML form (works without JavaScript) ----

const optionalNumber = z.number({ error: 'must be a number' }).optional();
const flatText = z.string().trim().max(500, 'must be at most 500 characters').default('');

/** Every key a run records a value for, in form order. */
export const RUN_VALUE_KEYS = [
	...NUMERIC_PARAMETER_KEYS,
	...CATEGORICAL_PARAMETER_KEYS,
	...AMBIENT_PARAMETER_KEYS
] as const;

/** Name of the reason field of a parameter in the flat form. */
export const reasonField = (key: string) => `reason_${key}`;

/** The run form: identifiers, one field per parameter, one reason per parameter. */
export const runFormSchema = z.object({
	line: z.string().trim().min(1, 'choose a line'),
	product: z.string().trim().min(1, 'choose a product'),
	stencil: z.string().trim().min(1, 'scan or type the stencil name').max(64),
	pasteLot: z.string().trim().min(1, 'scan or type the paste lot number').max(64),
	bladeCode: z.string().trim().max(64).default(''),
	// Checked by the API schema (printable, ≤ 100): the form only carries the text.
	boardSerial: z.string().max(500, 'must be at most 100 characters').default(''),
	boardsPrinted: z.number().int('must be a whole number').min(0).max(1_000_000).optional(),
	overrideReason: flatText,
	...(Object.fromEntries(NUMERIC_PARAMETER_KEYS.map((k) => [k, optionalNumber])) as Record<
		(typeof NUMERIC_PARAMETER_KEYS)[number],
		typeof optionalNumber
	>),
	...(Object.fromEntries(AMBIENT_PARAMETER_KEYS.map((k) => [k, optionalNumber])) as Record<
		(typeof AMBIENT_PARAMETER_KEYS)[number],
		typeof optionalNumber
	>),
	...(Object.fromEntries(CATEGORICAL_PARAMETER_KEYS.map((k) => [k, flatText])) as Record<
		(typeof CATEGORICAL_PARAMETER_KEYS)[number],
		typeof flatText
	>),
	...(Object.fromEntries(RUN_VALUE_KEYS.map((k) => [reasonField(k), flatText])) as Record<
		`reason_${(typeof RUN_VALUE_KEYS)[number]}`,
		typeof flatText
	>)
});

/** Parsed run form. */
export type RunForm = z.output<typeof runFormSchema>;

/** The API payload (input of printRunSchema) a run form stands for; blank values left out. */
export function runFormToPayload(form: RunForm): Record<string, unknown> {
	const values = form as unknown as Record<string, unknown>;
	const parameters: Record<string, unknown> = {};
	for (const key of [...NUMERIC_PARAMETER_KEYS, ...CATEGORICAL_PARAMETER_KEYS]) {
		const value = values[key];
		if (value !== undefined && value !== '' && value !== null) parameters[key] = value;
	}
	const reasons: Record<string, string> = {};
	for (const key of RUN_VALUE_KEYS) {
		const reason = values[reasonField(key)];
		if (typeof reason === 'string' && reason.trim()) reasons[key] = reason.trim();
	}
	return {
		line: form.line,
		product: form.product,
		stencil: form.stencil,
		pasteLot: form.pasteLot,
		parameters,
		...(Object.keys(reasons).length && { deviationReasons: reasons }),
		...(form.ambientTempC !== undefined && { ambientTempC: form.ambientTempC }),
		...(form.relativeHumidityPct !== undefined && {
			relativeHumidityPct: form.relativeHumidityPct
		}),
		...(form.boardsPrinted !== undefined && { boardsPrinted: form.boardsPrinted }),
		...(form.bladeCode && { bladeCode: form.bladeCode }),
		...(form.boardSerial.trim() && { boardSerial: form.boardSerial }),
		...(form.overrideReason && { overrideReason: form.overrideReason })
	};
}

/**
 * The flat form field a payload error belongs to: `parameters.x` → `x`,
 * `deviationReasons.x` → `reason_x`; top-level fields keep their name.
 * @example runFormField('deviationReasons.squeegeeAngleDeg') // 'reason_squeegeeAngleDeg'
 */
export function runFormField(field: string): string {
	if (field.startsWith('parameters.')) return field.slice('parameters.'.length).split('.')[0];
	if (field.startsWith('deviationReasons.'))
		return reasonField(field.slice('deviationReasons.'.length));
	return field.split('.')[0];
}

/** Group payload errors by flat form field. */
export function runFormErrors(errors: readonly FieldError[]): Record<string, string[]> {
	const grouped: Record<string, string[]> = {};
	for (const error of errors) (grouped[runFormField(error.field)] ??= []).push(error.message);
	return grouped;
}

/** Parsed filters as the run list takes them (dates as Date, `open` as boolean). */
export function toRunFilters(filters: z.output<typeof runFiltersSchema>): {
	line?: string;
	product?: string;
	stencil?: string;
	lot?: string;
	from?: Date;
	to?: Date;
	open?: boolean;
	limit?: number;
} {
	const { from, to, open, ...codes } = filters;
	return {
		...codes,
		...runFilterDates({ from, to }),
		...(open !== undefined && { open: open === 'true' })
	};
}
