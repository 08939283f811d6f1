import { z } from 'zod';

const DAY = /^\d{4}-\d{2}-\d{2}$/;

/** A calendar day (UTC) or a full ISO 8601 time; refused when it is not a real date. */
const when = (field: string) =>
	z
		.string()
		.max(40)
		.refine((v) => (DAY.test(v) || /^\d{4}-\d{2}-\d{2}T/.test(v)) && !Number.isNaN(Date.parse(v)), {
			error: `${field} must be a date (YYYY-MM-DD) or an ISO 8601 time`
		});

/** Filters of GET /api/audit, the audit page and its CSV (query parameters, all optional). */
export const auditQuerySchema = z
	.strictObject({
		user: z
			.string()
			.regex(/^[1-9]\d{0,9}$/, { error: 'user must be a user id (a whole number)' })
			.transform(Number)
			.optional(),
		kind: z
			.string()
			.regex(/^[a-z][a-z0-9_-]{0,39}$/, {
				error: 'kind must be a record kind such as "user" or "stencil"'
			})
			.optional(),
		from: when('from').optional(),
		to: when('to').optional(),
		page: z
			.string()
			.regex(/^[1-9]\d{0,5}$/, { error: 'page must be a whole number from 1' })
			.transform(Number)
			.optional(),
		pageSize: z
			.string()
			.regex(/^\d{1,3}$/, { error: 'pageSize must be a whole number from 1 to 200' })
			.transform(Number)
			.refine((n) => n >= 1 && n <= 200, { error: 'pageSize must be a whole number from 1 to 200' })
			.optional()
	})
	.refine((q) => !q.from || !q.to || boundsOf(q.from, 'from') <= boundsOf(q.to, 'to'), {
		error: 'from must not be after to',
		path: ['from']
	});

export type AuditQuery = z.infer<typeof auditQuerySchema>;

/** `from` starts its day, `to` ends its day (a bare date is the whole UTC day). */
export function boundsOf(value: string, side: 'from' | 'to'): number {
	if (DAY.test(value))
		return Date.parse(`${value}T00:00:00Z`) + (side === 'to' ? 86_400_000 - 1 : 0);
	return Date.parse(value);
}

/** Query parameters of a URL, blank ones dropped (an empty filter field means "any"). */
export function auditQueryParams(url: URL): Record<string, string> {
	return Object.fromEntries([...url.searchParams].filter(([, v]) => v.trim() !== ''));
}
