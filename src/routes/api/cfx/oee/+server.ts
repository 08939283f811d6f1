import { json } from '@sveltejs/kit';
import { parseDay, parseMinutes, parseShiftStarts } from '$lib/cfx/query-params';
import { ApiError, apiRoute } from '$lib/server/api';
import { getDb } from '$lib/server/db';
import { printerOee } from '$lib/server/cfx';
import { siteShiftSettings } from '$lib/server/floor/shift-settings';

const KNOWN = new Set(['day', 'line', 'shifts', 'idleMinutes']);

/**
 * OEE per printer and shift of one site-local day, each factor with how it was computed. Shifts:
 * the site's (SHIFT_STARTS on the SITE_TIME_ZONE clock) unless `shifts=` names others.
 */
export const GET = apiRoute(({ url }) => {
	const site = siteShiftSettings();
	const unknown = [...url.searchParams.keys()].filter((k) => !KNOWN.has(k));
	const day = parseDay(url.searchParams.get('day'));
	const shiftsParam = url.searchParams.get('shifts');
	const shifts =
		shiftsParam === null
			? { ok: true as const, value: [...site.starts] }
			: parseShiftStarts(shiftsParam);
	const idle = parseMinutes(url.searchParams.get('idleMinutes'), 'idleMinutes', 5, 1, 240);
	const fields = [
		...unknown.map((k) => ({ field: k, message: 'is not a parameter of this route' })),
		...[day, shifts, idle]
			.filter((r) => !r.ok)
			.map((r) => ({
				field: (r as { field: string }).field,
				message: (r as { message: string }).message
			}))
	];
	if (fields.length || !day.ok || !shifts.ok || !idle.ok)
		throw new ApiError(400, { error: 'The query has invalid parameters.', fields });
	const printers = printerOee(getDb(), {
		day: day.value,
		shiftStarts: shifts.value,
		timeZone: site.timeZone,
		line: url.searchParams.get('line'),
		idleAfterMs: idle.value * 60_000
	});
	return json({
		day: day.value,
		shifts: shifts.value,
		timeZone: site.timeZone,
		idleMinutes: idle.value,
		printers
	});
});
