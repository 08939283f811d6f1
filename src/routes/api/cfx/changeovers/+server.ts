import { json } from '@sveltejs/kit';
import { parseInstant } from '$lib/cfx/query-params';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { lineChangeovers } from '$lib/server/cfx';

const KNOWN = new Set(['line', 'from', 'to']);
const MAX_SPAN_MS = 31 * 24 * 3_600_000;

/** Stencil and product changeovers measured from the machines' messages, at most 31 days. */
export const GET = apiRoute(({ url }) => {
	const unknown = [...url.searchParams.keys()].filter((k) => !KNOWN.has(k));
	const from = parseInstant(url.searchParams.get('from'), 'from');
	const to = parseInstant(url.searchParams.get('to'), 'to');
	const fields = [
		...unknown.map((k) => ({ field: k, message: 'is not a parameter of this route' })),
		...[from, to]
			.filter((r) => !r.ok)
			.map((r) => ({
				field: (r as { field: string }).field,
				message: (r as { message: string }).message
			}))
	];
	if (fields.length || !from.ok || !to.ok)
		throw new ApiError(400, { error: 'The query has invalid parameters.', fields });
	if (to.value <= from.value || to.value - from.value > MAX_SPAN_MS) {
		throw new ApiError(400, {
			error: 'The query has invalid parameters.',
			fields: [{ field: 'to', message: 'must be after from, at most 31 days later' }]
		});
	}
	const found = lineChangeovers(getDb(), {
		fromMs: from.value,
		toMs: to.value,
		line: url.searchParams.get('line')
	});
	return json({
		changeovers: found.map((c) => ({
			line: c.line,
			kind: c.kind,
			at: new Date(c.atMs).toISOString(),
			from: c.from,
			to: c.to,
			lastBoardBefore:
				c.lastBoardBeforeMs === null ? null : new Date(c.lastBoardBeforeMs).toISOString(),
			firstBoardAfter:
				c.firstBoardAfterMs === null ? null : new Date(c.firstBoardAfterMs).toISOString(),
			durationMs: c.durationMs
		}))
	});
});
