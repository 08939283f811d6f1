/**
 * Zod schemas for the stencil pages' forms (superforms): create a stencil, start a revision, type
 * in one aperture, edit the site thresholds. The API bodies are in `stencil.ts`.
 */
import { z } from 'zod';
import { STENCIL_TECHNOLOGIES, type StencilTechnology } from '../stencil/thresholds';
import { checkStepRegions, type StepRegion } from '../stencil/step-regions';
import { formatProblem } from '../stencil/stencil-input-error';

const technology = z
	.enum(STENCIL_TECHNOLOGIES as [StencilTechnology, ...StencilTechnology[]])
	.default('laser-stainless');
const thickness = z
	.number({ error: 'thickness is required (µm)' })
	.min(1, { error: 'thickness must be at least 1 µm' })
	.max(1000, { error: 'thickness must be at most 1000 µm' });

/** The "new stencil" form (thickness in µm). */
export const stencilFormSchema = z.object({
	name: z.string().trim().min(1, { error: 'name is required' }).max(200),
	revision: z.string().trim().min(1, { error: 'revision is required' }).max(50),
	thicknessUm: thickness,
	technology,
	ratedLifePrints: z
		.number()
		.int({ error: 'rated life must be a whole number of prints' })
		.positive({ error: 'rated life must be greater than 0' })
		.max(10_000_000)
		.optional(),
	notes: z.string().max(5000).default(''),
	/** One step region a line: "xMin yMin xMax yMax thickness" (mm, mm, mm, mm, µm). */
	stepRegions: z.string().max(10_000).default('')
});

/**
 * Read the step-region field of the stencil forms: one region a line, `xMin yMin xMax yMax T`
 * with the corners in mm and the local thickness T in µm (how a drawing gives them).
 * @example parseStepRegionsText('40 40 50 50 100') // { regions: [{ xMinUm: 40000, …, thicknessUm: 100 }] }
 */
export function parseStepRegionsText(text: string): { regions: StepRegion[] } | { error: string } {
	const regions: StepRegion[] = [];
	const lines = text.split(/\r?\n|;/).map((l) => l.trim());
	for (let i = 0; i < lines.length; i++) {
		if (lines[i] === '') continue;
		const v = lines[i].split(/[\s,]+/).map(Number);
		if (v.length !== 5 || !v.every(Number.isFinite))
			return {
				error: `step region ${regions.length + 1}: write five numbers, the left, bottom, right and top edge in mm and the thickness in µm (got "${lines[i]}")`
			};
		regions.push({
			xMinUm: v[0] * 1000,
			yMinUm: v[1] * 1000,
			xMaxUm: v[2] * 1000,
			yMaxUm: v[3] * 1000,
			thicknessUm: v[4]
		});
	}
	const problems = checkStepRegions(regions);
	if (problems.length > 0) return { error: problems.map(formatProblem).join('; ') };
	return { regions };
}

/** The "new revision" form: the name stays; apertures are copied from the current revision. */
export const revisionFormSchema = stencilFormSchema.omit({ name: true });

/** One aperture typed in (µm, degrees); fields that do not apply to the shape are ignored. */
export const apertureFormSchema = z.object({
	refdes: z.string().trim().max(64).default(''),
	pad: z.string().trim().max(32).default(''),
	shape: z.enum(['rectangle', 'rounded-rectangle', 'circle', 'polygon']).default('rectangle'),
	lengthUm: z.number().optional(),
	widthUm: z.number().optional(),
	cornerRadiusUm: z.number().optional(),
	diameterUm: z.number().optional(),
	/** Polygon vertices "x y;x y;…" in µm, relative to the position. */
	vertices: z.string().max(20_000).default(''),
	xUm: z.number().default(0),
	yUm: z.number().default(0),
	rotationDeg: z.number().default(0)
});

const ratio = z
	.number({ error: 'a number is required' })
	.gt(0, { error: 'must be greater than 0' })
	.max(10, { error: 'must be at most 10' });

/** Site thresholds: minimum area and aspect ratio per technology. */
export const thresholdsFormSchema = z.object(
	Object.fromEntries(
		STENCIL_TECHNOLOGIES.map((t) => [t, z.object({ minAreaRatio: ratio, minAspectRatio: ratio })])
	) as Record<
		StencilTechnology,
		z.ZodObject<{ minAreaRatio: typeof ratio; minAspectRatio: typeof ratio }>
	>
);
