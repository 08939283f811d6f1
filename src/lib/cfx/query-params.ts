/**
 * Strict query parameters of the CFX read routes: each wrong value is named, nothing is guessed.
 */

export type ParamResult<T> = { ok: true; value: T } | { ok: false; field: string; message: string };

const DAY = /^(\d{4})-(\d{2})-(\d{2})$/;
const HHMM = /^([01]\d|2[0-3]):([0-5]\d)$/;

/** `YYYY-MM-DD`, a real calendar day between 1970 and 2100. */
export function parseDay(value: string | null, field = 'day'): ParamResult<string> {
	const m = value ? DAY.exec(value) : null;
	if (!m) return { ok: false, field, message: 'must be a date like 2026-12-03' };
	const t = Date.UTC(+m[1], +m[2] - 1, +m[3]);
	const d = new Date(t);
	if (+m[1] < 1970 || +m[1] > 2100 || d.getUTCMonth() !== +m[2] - 1 || d.getUTCDate() !== +m[3]) {
		return { ok: false, field, message: `${value} is not a calendar day (1970–2100)` };
	}
	return { ok: true, value: value! };
}

/** Comma-separated shift starts `HH:MM` (site wall clock), 1 to 6 of them, all different. */
export function parseShiftStarts(value: string | null): ParamResult<string[]> {
	if (value === null) return { ok: true, value: ['06:00', '14:00', '22:00'] };
	const parts = value.split(',').map((p) => p.trim());
	if (
		parts.length < 1 ||
		parts.length > 6 ||
		parts.some((p) => !HHMM.test(p)) ||
		new Set(parts).size !== parts.length
	) {
		return {
			ok: false,
			field: 'shifts',
			message: 'must be 1–6 different start times like 06:00,14:00,22:00 (site time)'
		};
	}
	return { ok: true, value: parts };
}

/** A whole number of minutes in [min, max], or the default when absent. */
export function parseMinutes(
	value: string | null,
	field: string,
	fallback: number,
	min: number,
	max: number
): ParamResult<number> {
	if (value === null) return { ok: true, value: fallback };
	if (!/^\d{1,4}$/.test(value) || +value < min || +value > max) {
		return { ok: false, field, message: `must be a whole number of minutes from ${min} to ${max}` };
	}
	return { ok: true, value: +value };
}

/** An ISO 8601 time with a zone, or a `YYYY-MM-DD` day (its start in UTC). */
export function parseInstant(value: string | null, field: string): ParamResult<number> {
	if (value === null)
		return { ok: false, field, message: 'is required (2026-12-03 or an ISO time with a zone)' };
	if (DAY.test(value)) {
		const day = parseDay(value, field);
		return day.ok ? { ok: true, value: Date.parse(`${value}T00:00:00Z`) } : day;
	}
	if (
		!/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?(Z|[+-]\d{2}:\d{2})$/.test(value) ||
		Number.isNaN(Date.parse(value))
	) {
		return { ok: false, field, message: 'must be 2026-12-03 or an ISO time with a zone' };
	}
	return { ok: true, value: Date.parse(value) };
}
