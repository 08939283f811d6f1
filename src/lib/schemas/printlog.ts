/**
 * Zod schemas for the print-log API payloads (safe for the client: they import only the pure
 * rules in $lib/printlog). Shape errors come from zod; domain errors (windows out of order,
 * physical ranges, J-STD classes, dates) come from the same rule functions the server uses,
 * so a form and the API show the same messages. Turn a ZodError into the print log's one
 * message format (`<field>: <message>`) with `fieldErrorsFromZod`.
 *
 * Codes: lines, products, stencils and paste lots are referred to by code (line code, product
 * code, stencil name, lot number), trimmed, 1–64 characters.
 *
 * Categorical recipe parameters may be sent plain (`"printStroke": "alternating"`) or wrapped
 * (`"printStroke": { "value": "alternating" }`) so a client can treat every parameter as an
 * object; both parse to the plain canonical value (lower case; wipe mode as 'wet-vacuum-dry').
 */
import { z } from 'zod';
import type { FieldError } from '../printlog/field-error';
import { PASTE_EVENTS } from '../printlog/paste-events';
import { resolvePasteHandling, validatePasteLot } from '../printlog/paste-lot';
import { parseBoardSerial } from '../printlog/board-serial';
import {
	CATEGORICAL_PARAMETER_KEYS,
	NUMERIC_PARAMETER_KEYS,
	REQUIRED_RECIPE_PARAMETERS,
	physicalRangeProblem
} from '../printlog/parameters';
import type { CategoricalParameterKey, WindowedParameterKey } from '../printlog/parameters';
import { normaliseCategorical, validateWindow } from '../printlog/recipe-window';

/** A code (line, product, stencil name, lot number): trimmed, 1–64 characters. */
const code = z.string().trim().min(1, 'must not be blank').max(64, 'must be at most 64 characters');

/** Free text such as a reason or note: trimmed, at most 500 characters. */
const text = z.string().trim().max(500, 'must be at most 500 characters');

/**
 * A board serial as scanned: cleaned (scanner prefix and control characters at the ends
 * removed, case kept) and checked (printable ASCII, at most 100 characters). Blank → null.
 */
export const boardSerialSchema = z
	.string({ error: 'must be text: the serial of the first board printed' })
	.transform((raw, ctx) => {
		const parsed = parseBoardSerial(raw);
		if (!parsed.error) return parsed.value;
		ctx.addIssue({ code: 'custom', message: parsed.error.message });
		return z.NEVER;
	});

/** An instant with an explicit zone (`Z` or offset), as the tablet sends it. */
const instant = z.iso.datetime({
	offset: true,
	error: 'must be an ISO 8601 date-time with a time zone, e.g. 2026-03-02T08:00:00Z'
});

/** Push the print-log rule errors onto the zod context, paths relative to `base`. */
function addFieldErrors(ctx: z.RefinementCtx, errors: readonly FieldError[]) {
	for (const error of errors) {
		ctx.addIssue({ code: 'custom', message: error.message, path: toPath(error.field) });
	}
}

/** `parameters.x.max` / `events[2].at` → ['parameters', 'x', 'max'] / ['events', 2, 'at']. */
function toPath(field: string): (string | number)[] {
	return field
		.split(/\.|\[(\d+)\]/)
		.filter((part) => part !== undefined && part !== '')
		.map((part) => (/^\d+$/.test(part) ? Number(part) : part));
}

/** A recipe window for one numeric parameter, checked by the print-log rules. */
function windowSchema(key: WindowedParameterKey) {
	return z
		.strictObject({ min: z.number(), target: z.number(), max: z.number() })
		.superRefine((window, ctx) => {
			addFieldErrors(ctx, validateWindow(key, window, 'w').map(stripPrefix));
		});
}

/** Drop the placeholder prefix `w.` used to get relative paths from validateWindow. */
function stripPrefix(error: FieldError): FieldError {
	return { ...error, field: error.field.replace(/^w\.?/, '') };
}

/** One actual numeric value, checked against the parameter's physical range. */
function actualValue(key: WindowedParameterKey) {
	return z.number().superRefine((value, ctx) => {
		const problem = physicalRangeProblem(key, value);
		if (problem) ctx.addIssue({ code: 'custom', message: problem });
	});
}

/** A categorical value, plain or `{ value }`, parsed to its canonical form. */
function categoricalValue(key: CategoricalParameterKey) {
	return z.union([z.string(), z.strictObject({ value: z.string() })]).transform((raw, ctx) => {
		const result = normaliseCategorical(key, raw, '');
		if (result.ok) return result.value;
		ctx.addIssue({ code: 'custom', message: result.error.message });
		return z.NEVER;
	});
}

/** Build a strict object with one optional entry per key. */
function entries<K extends string, S extends z.ZodType>(keys: readonly K[], make: (key: K) => S) {
	const shape = Object.fromEntries(keys.map((key) => [key, make(key).optional()]));
	return shape as { [P in K]: z.ZodOptional<S> };
}

/** `POST /api/recipes`: a window per numeric parameter, an expected value per categorical one. */
export const recipeSchema = z.strictObject({
	product: code,
	line: code,
	/** Ideal cycle time of one board, s (OEE performance); omitted: the current version's kept; null: none. */
	idealCycleTimeS: z.number().positive().max(3600).nullable().optional(),
	parameters: z
		.strictObject({
			...entries(NUMERIC_PARAMETER_KEYS, windowSchema),
			ambientTempC: windowSchema('ambientTempC').optional(),
			relativeHumidityPct: windowSchema('relativeHumidityPct').optional(),
			...entries(CATEGORICAL_PARAMETER_KEYS, categoricalValue)
		})
		.superRefine((parameters, ctx) => {
			for (const key of REQUIRED_RECIPE_PARAMETERS) {
				if (parameters[key] === undefined) {
					ctx.addIssue({
						code: 'custom',
						message: 'is required: give a window { min, target, max }',
						path: [key]
					});
				}
			}
		})
});

/**
 * `POST /api/print-runs`. The route answers 201 `{ id, deviations }`, or 422 naming the
 * parameters whose deviation lacks a reason (see deviationReasonErrors in $lib/printlog).
 */
export const printRunSchema = z.strictObject({
	line: code,
	product: code,
	stencil: code,
	pasteLot: code,
	parameters: z.strictObject({
		...entries(NUMERIC_PARAMETER_KEYS, actualValue),
		...entries(CATEGORICAL_PARAMETER_KEYS, categoricalValue)
	}),
	// partialRecord: a plain record with enum keys would demand a reason for every parameter.
	deviationReasons: z
		.partialRecord(
			z.enum([
				...NUMERIC_PARAMETER_KEYS,
				...CATEGORICAL_PARAMETER_KEYS,
				'ambientTempC',
				'relativeHumidityPct'
			]),
			text
		)
		.optional(),
	ambientTempC: actualValue('ambientTempC').optional(),
	relativeHumidityPct: actualValue('relativeHumidityPct').optional(),
	boardsPrinted: z
		.number()
		.int('must be a whole number')
		.min(0, 'must be ≥ 0')
		.max(1_000_000, 'must be ≤ 1000000')
		.optional(),
	startedAt: instant.optional(),
	bladeCode: code.optional(),
	boardSerial: boardSerialSchema.optional(),
	overrideReason: text.optional()
});

/** Optional whole minutes for a handling setting (bounds checked by resolvePasteHandling). */
const minutes = z.number().optional();

/** `POST /api/paste-lots`. Dates are ISO dates (`2026-06-30`) or date-times with a zone. */
export const pasteLotSchema = z
	.strictObject({
		lotNumber: z.string().trim().max(64, 'must be at most 64 characters'),
		alloy: z.string().trim(),
		powderType: z.number(),
		expiresOn: z.string().trim(),
		fluxClass: z.string().trim().toUpperCase().optional(),
		containerGrams: z.number().optional(),
		receivedOn: z.string().trim().optional(),
		warmUpMinutes: minutes,
		maxOnStencilMinutes: minutes,
		maxOutOfColdMinutes: minutes,
		/** The receiver confirms dates that look wrong (already expired, years ahead…). */
		confirmDates: z.boolean().optional()
	})
	.superRefine((lot, ctx) => {
		addFieldErrors(ctx, validatePasteLot(lot));
		addFieldErrors(ctx, resolvePasteHandling(lot).errors);
	});

/** `POST /api/paste-lots/{id}/events`; `at` defaults to the server's now in the route. */
export const pasteEventSchema = z.strictObject({
	event: z.enum(PASTE_EVENTS, { error: `must be one of ${PASTE_EVENTS.join(', ')}` }),
	at: instant.optional(),
	note: text.optional()
});

/** Parsed recipe payload. */
export type RecipePayload = z.output<typeof recipeSchema>;
/** Parsed print-run payload. */
export type PrintRunPayload = z.output<typeof printRunSchema>;
/** Parsed paste-lot payload. */
export type PasteLotPayload = z.output<typeof pasteLotSchema>;
/** Parsed paste-event payload. */
export type PasteEventPayload = z.output<typeof pasteEventSchema>;

/**
 * Convert a ZodError to the print log's field errors (`parameters.squeegeeAngleDeg.max`,
 * `events[2].at`), for 400/422 bodies and forms.
 * @example fieldErrorsFromZod(printRunSchema.safeParse({}).error!)[0] // { field: 'line', message: '…' }
 */
export function fieldErrorsFromZod(error: z.ZodError): FieldError[] {
	return error.issues.map((issue) => ({
		field:
			issue.path
				.map((part, i) => {
					if (typeof part === 'number') return `[${part}]`;
					return `${i === 0 ? '' : '.'}${String(part)}`;
				})
				.join('') || '(body)',
		message: issue.message
	}));
}
