/**
 * Zod schemas for the stencil API payloads (`POST /api/stencils`, aperture uploads as JSON).
 * Field-level checks are done by zod; geometric checks (corner radius vs size, polygon
 * validity) reuse the stencil module's `checkAperture`, so the API and CSV import agree.
 * Error paths name the index, e.g. `apertures[3].widthUm` (see `formatIssuePath`).
 */
import { z } from 'zod';
import type { ApertureInput } from '../stencil/aperture';
import {
	checkAperture,
	MAX_APERTURE_DIMENSION_UM,
	MAX_POSITION_UM
} from '../stencil/aperture-validation';
import { checkStepRegions } from '../stencil/step-regions';
import { STENCIL_TECHNOLOGIES } from '../stencil/thresholds';

/** Largest number of apertures accepted in one request. */
export const MAX_APERTURES_PER_REQUEST = 50_000;

const size = z.number().positive().max(MAX_APERTURE_DIMENSION_UM);
const position = z.number().min(-MAX_POSITION_UM).max(MAX_POSITION_UM).default(0);
const common = {
	refdes: z.string().trim().max(64),
	pad: z.string().trim().max(32),
	xUm: position,
	yUm: position,
	rotationDeg: z.number().default(0)
};

const rectangleSchema = z.object({
	...common,
	shape: z.enum(['rectangle', 'rounded-rectangle']),
	lengthUm: size,
	widthUm: size,
	cornerRadiusUm: z
		.number()
		.min(0)
		.max(MAX_APERTURE_DIMENSION_UM / 2)
		.optional()
});

const circleSchema = z.object({ ...common, shape: z.literal('circle'), diameterUm: size });

const polygonSchema = z.object({
	...common,
	shape: z.literal('polygon'),
	verticesUm: z
		.array(z.tuple([z.number(), z.number()]))
		.min(3)
		.max(1000)
});

/** Map a `checkAperture` field such as `verticesUm[2]` to a zod path. */
function fieldPath(field: string): (string | number)[] {
	const m = /^(\w+)\[(\d+)\]$/.exec(field);
	return m ? [m[1], Number(m[2])] : [field];
}

/**
 * One aperture as JSON. `xUm`, `yUm`, `rotationDeg` default to 0; shape `rectangle` with
 * `cornerRadiusUm` > 0 is accepted as a rounded rectangle. Output type: `ApertureInput`.
 * @example apertureSchema.parse({ refdes: 'U1', pad: '1', shape: 'circle', diameterUm: 300 })
 * // { refdes: 'U1', pad: '1', shape: 'circle', diameterUm: 300, xUm: 0, yUm: 0, rotationDeg: 0 }
 */
export const apertureSchema = z
	.discriminatedUnion('shape', [rectangleSchema, circleSchema, polygonSchema])
	.transform((a) => a as ApertureInput)
	// Runs only when the fields above are valid, so messages are not repeated.
	.pipe(
		z.custom<ApertureInput>().superRefine((a, ctx) => {
			for (const p of checkAperture(a))
				ctx.addIssue({ code: 'custom', path: fieldPath(p.field), message: p.message });
		})
	);

/**
 * Aperture upload body: `{ "apertures": [ … ] }`, 1 to 50,000 apertures.
 * @example aperturesPayloadSchema.safeParse({ apertures: [] }).success // false
 */
export const aperturesPayloadSchema = z.object({
	apertures: z.array(apertureSchema).min(1).max(MAX_APERTURES_PER_REQUEST)
});

/** A step region as JSON (µm). */
export const stepRegionSchema = z
	.object({
		xMinUm: z.number(),
		yMinUm: z.number(),
		xMaxUm: z.number(),
		yMaxUm: z.number(),
		thicknessUm: z.number().positive().max(1000)
	})
	.superRefine((r, ctx) => {
		for (const p of checkStepRegions([r]))
			if (p.field !== 'thicknessUm')
				ctx.addIssue({ code: 'custom', path: [p.field], message: p.message });
	});

/**
 * `POST /api/stencils` body. Thickness 1–1000 µm; technology one of `STENCIL_TECHNOLOGIES`.
 * @example stencilCreateSchema.parse({ name: 'Main board top', revision: 'B', thicknessUm: 120, technology: 'laser-stainless' })
 */
export const stencilCreateSchema = z.object({
	name: z.string().trim().min(1).max(200),
	revision: z.string().trim().min(1).max(50),
	thicknessUm: z.number().min(1).max(1000),
	technology: z
		.enum(STENCIL_TECHNOLOGIES as [string, ...string[]])
		.transform((t) => t as (typeof STENCIL_TECHNOLOGIES)[number]),
	ratedLifePrints: z.number().int().positive().max(10_000_000).optional(),
	notes: z.string().max(5000).optional(),
	stepRegions: z.array(stepRegionSchema).max(100).optional()
});

/** Parsed `POST /api/stencils` body. */
export type StencilCreateInput = z.infer<typeof stencilCreateSchema>;

/**
 * Format a zod issue path the way a programmer writes it: `apertures[3].widthUm`.
 * @example formatIssuePath(['apertures', 3, 'verticesUm', 0]) // 'apertures[3].verticesUm[0]'
 */
export function formatIssuePath(path: readonly PropertyKey[]): string {
	return path
		.map((p, i) => (typeof p === 'number' ? `[${p}]` : `${i === 0 ? '' : '.'}${String(p)}`))
		.join('');
}

/**
 * Flatten a zod error for an API response: `[{ path: 'apertures[3].widthUm', message }]`.
 * @example schemaErrors(aperturesPayloadSchema.safeParse(body).error!)
 */
export function schemaErrors(error: z.ZodError): { path: string; message: string }[] {
	return error.issues.map((i) => ({
		path: formatIssuePath(i.path) || '(body)',
		message: i.message
	}));
}
