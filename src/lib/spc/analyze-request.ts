import { z } from 'zod';
import { RULE_IDS } from './run-rules';

/**
 * Request body of `POST /api/spc/analyze` (types only; the cross-field checks such as
 * equal subgroup sizes and LSL < USL are done by `analyzeStudy`, which names the subgroup).
 */

function describe(input: unknown): string {
	if (input === undefined) return 'nothing';
	if (input === null) return 'null';
	if (typeof input === 'string') return `text ${JSON.stringify(input.slice(0, 40))}`;
	if (typeof input === 'number') return String(input);
	return Array.isArray(input) ? 'an array' : typeof input;
}

const finiteNumber = z.number({
	error: (issue) => `expected a finite number, got ${describe(issue.input)}`
});

/** Chart kinds accepted by the API. */
export const SPC_API_CHARTS = ['xbar-r', 'xbar-s', 'i-mr', 'between-within'] as const;

/** Chart kind of the request: `xbar-r`, `xbar-s`, `i-mr` or `between-within`. */
export const spcChartSchema = z.enum(SPC_API_CHARTS, {
	error: `must be one of: ${SPC_API_CHARTS.join(', ')}`
});

/** One run-rule id: `we-1`..`we-4`, `nelson-1`..`nelson-8`. */
export const spcRuleSchema = z.enum(RULE_IDS, {
	error: `must be one of: ${RULE_IDS.join(', ')}`
});

/**
 * Body of `POST /api/spc/analyze`; numbers must be finite (NaN, Infinity and text are refused
 * with the element path, e.g. `subgroups[3][1]`).
 * @example spcAnalyzeRequestSchema.safeParse({ chart: 'i-mr', values: [1, 2, 3] })
 */
export const spcAnalyzeRequestSchema = z.object(
	{
		chart: spcChartSchema,
		subgroups: z
			.array(z.array(finiteNumber, { error: 'expected an array of numbers' }), {
				error: 'expected an array of subgroups (arrays of numbers)'
			})
			.optional(),
		values: z.array(finiteNumber, { error: 'expected an array of numbers' }).optional(),
		lsl: finiteNumber.nullish(),
		usl: finiteNumber.nullish(),
		target: finiteNumber.nullish(),
		rules: z.array(spcRuleSchema, { error: 'expected an array of rule ids' }).optional()
	},
	{ error: 'expected a JSON object with "chart" and "subgroups" or "values"' }
);

/** Parsed request of `POST /api/spc/analyze`. */
export type SpcAnalyzeRequest = z.infer<typeof spcAnalyzeRequestSchema>;
