import { json } from '@sveltejs/kit';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { lineMachineEvents, MAX_LINE_EVENTS } from '$lib/server/cfx';

const KNOWN = new Set(['line', 'limit']);

/** Machine events of one line (or all lines), newest first, with their words. */
export const GET = apiRoute(({ url }) => {
	const fields = [...url.searchParams.keys()]
		.filter((k) => !KNOWN.has(k))
		.map((k) => ({ field: k, message: 'is not a parameter of this route' }));
	const limitText = url.searchParams.get('limit');
	if (
		limitText !== null &&
		(!/^\d{1,4}$/.test(limitText) || +limitText < 1 || +limitText > MAX_LINE_EVENTS)
	)
		fields.push({ field: 'limit', message: `must be a whole number from 1 to ${MAX_LINE_EVENTS}` });
	if (fields.length)
		throw new ApiError(400, { error: 'The query has invalid parameters.', fields });
	const db = getDb();
	const code = url.searchParams.get('line');
	let lineId: number | null = null;
	if (code !== null) {
		const row = db.$client
			.prepare(`select id from lines where upper(code) = upper(?)`)
			.pluck()
			.get(code.slice(0, 100)) as number | undefined;
		if (row === undefined)
			throw new ApiError(404, {
				error: 'No such line.',
				fields: [
					{ field: 'line', message: `no line with the code ${JSON.stringify(code.slice(0, 100))}` }
				]
			});
		lineId = row;
	}
	return json({ events: lineMachineEvents(db, lineId, limitText === null ? 20 : +limitText) });
});
