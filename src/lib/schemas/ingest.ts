/**
 * Zod schema for SPI mapping profiles (saved per export layout, chosen on upload). Checks that
 * the timestamp pattern compiles, the time zone is known to Intl, the serial pattern compiles on
 * RE2 (linear-time matching) with exactly one capture group, and no word means two results.
 */
import { z } from 'zod';
import { CANONICAL_FIELDS, type CanonicalField } from '../ingest/canonical-fields';
import type { MappingProfile } from '../ingest/mapping-profile';
import { compileTimestampPattern } from '../ingest/parse-timestamp';
import { compileSerialPattern } from '../ingest/serial-pattern';
import { isValidTimeZone } from '../ingest/zoned-time-to-utc';

const headerName = z.string().trim().min(1, { error: 'column name is empty' }).max(120);

const columnsShape = Object.fromEntries(
	CANONICAL_FIELDS.map((f) => [f, headerName.optional()])
) as Record<CanonicalField, z.ZodOptional<typeof headerName>>;

const words = z.array(z.string().trim().min(1, { error: 'result word is empty' }).max(40)).max(20);

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
		timeZone: z.string().trim().refine(isValidTimeZone, {
			error: 'unknown time zone (use an IANA name like Europe/Berlin)'
		}),
		resultWords: z.object({ pass: words.min(1), warn: words, fail: words.min(1) }),
		serialFromFileName: z
			.object({
				// Compiled on RE2 (linear time): a pattern it refuses is refused here, with its reason.
				pattern: z.string().superRefine((pattern, ctx) => {
					const check = compileSerialPattern(pattern);
					if (!check.ok) ctx.addIssue({ code: 'custom', message: check.reason });
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
