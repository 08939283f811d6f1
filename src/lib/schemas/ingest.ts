/**
 * Zod schema for SPI mapping profiles (saved per export layout, chosen on upload). Checks that
 * the timestamp pattern compiles, the time zone is known to Intl, the serial pattern is a
 * regex with exactly one capture group, and no word means two results.
 */
import { z } from 'zod';
import { CANONICAL_FIELDS, type CanonicalField } from '../ingest/canonical-fields';
import type { MappingProfile } from '../ingest/mapping-profile';
import { compileTimestampPattern } from '../ingest/parse-timestamp';
import { isValidTimeZone } from '../ingest/zoned-time-to-utc';

const headerName = z.string().trim().min(1, { error: 'column name is empty' }).max(120);

const columnsShape = Object.fromEntries(
	CANONICAL_FIELDS.map((f) => [f, headerName.optional()])
) as Record<CanonicalField, z.ZodOptional<typeof headerName>>;

const words = z.array(z.string().trim().min(1, { error: 'result word is empty' }).max(40)).max(20);

/** Number of capture groups of a regex source; NaN when it does not compile. */
function captureGroups(pattern: string): number {
	try {
		// Matching '' against `pattern|` always succeeds, and the match has one slot per group.
		return (new RegExp(`${pattern}|`).exec('') as RegExpExecArray).length - 1;
	} catch {
		return NaN;
	}
}

/**
 * Mapping profile as saved by the mapping screen and read by the ingest service. Output type is
 * `MappingProfile` (`$lib/ingest`).
 * @example mappingProfileSchema.safeParse(CANONICAL_PROFILE).success // true
 */
export const mappingProfileSchema: z.ZodType<MappingProfile> = z
	.object({
		name: z.string().trim().min(1, { error: 'profile name is required' }).max(120),
		machine: z.string().trim().max(120),
		delimiter: z.enum(['auto', ',', ';', '\t']),
		decimalComma: z.boolean(),
		columns: z.object(columnsShape).strict(),
		lengthUnit: z.enum(['um', 'mm', 'mil']),
		volumeMode: z.enum(['percent', 'absolute-um3', 'absolute-mil3']),
		timestampFormat: z
			.string()
			.trim()
			.min(1)
			.max(60)
			.superRefine((pattern, ctx) => {
				try {
					compileTimestampPattern(pattern);
				} catch (e) {
					ctx.addIssue({ code: 'custom', message: (e as Error).message });
				}
			}),
		timeZone: z
			.string()
			.trim()
			.refine(isValidTimeZone, {
				error: 'unknown time zone (use an IANA name like Europe/Berlin)'
			}),
		resultWords: z.object({ pass: words.min(1), warn: words, fail: words.min(1) }),
		serialFromFileName: z
			.object({
				pattern: z
					.string()
					.min(1)
					.max(200)
					.refine((p) => captureGroups(p) === 1, {
						error:
							'serial pattern must be a valid regular expression with exactly one (capture group)'
					})
			})
			.optional(),
		constants: z
			.object({
				line: z.string().trim().min(1).max(100).optional(),
				product: z.string().trim().min(1).max(100).optional(),
				panelIndex: z.number().int().min(0).max(65535).optional()
			})
			.optional(),
		onBadRow: z.enum(['reject-file', 'skip-row'])
	})
	.superRefine((profile, ctx) => {
		const seen = new Map<string, string>();
		for (const kind of ['pass', 'warn', 'fail'] as const) {
			for (const w of profile.resultWords[kind]) {
				const key = w.trim().toLowerCase();
				const other = seen.get(key);
				if (other !== undefined && other !== kind) {
					ctx.addIssue({
						code: 'custom',
						path: ['resultWords', kind],
						message: `result word "${w}" is also listed under ${other}`
					});
				}
				seen.set(key, kind);
			}
		}
	});
