/**
 * The site's shifts: start times of day on the site's wall clock (e.g. 06:00, 14:00, 22:00 in
 * Europe/Berlin), each shift running to the next start. Pure: wall time ↔ instant through `Intl`
 * only (`../ingest/zoned-time-to-utc`), so a shift that spans a DST change is an hour longer or
 * shorter, exactly as the clock on the wall says.
 *
 * A shift belongs to the site-local day it starts on: the 22:00 shift of 3 December ends at 06:00
 * on the 4th and is still `day: '2026-12-03'`.
 */

import { isValidTimeZone, timeZoneOffsetMs, zonedTimeToUtc } from '../ingest/zoned-time-to-utc';

export interface ShiftSettings {
	/** Start times `HH:MM` on the site's wall clock, sorted, all different (1–6 of them). */
	starts: readonly string[];
	/** IANA time zone of the site, e.g. `Europe/Berlin`; `UTC` by default. */
	timeZone: string;
}

export interface Shift {
	/** Site-local day the shift starts on, `YYYY-MM-DD`. */
	day: string;
	/** Its start time as configured, `HH:MM` (site wall clock). */
	start: string;
	/** 0-based position among the day's shifts (by start time). */
	index: number;
	/** `2026-12-03 22:00`: day and start, unique per shift, sorts in time order. */
	key: string;
	startMs: number;
	/** The next shift's start (exclusive). */
	endMs: number;
}

export const DEFAULT_SHIFT_STARTS: readonly string[] = ['06:00', '14:00', '22:00'];
export const DEFAULT_SHIFT_SETTINGS: ShiftSettings = {
	starts: DEFAULT_SHIFT_STARTS,
	timeZone: 'UTC'
};

const HHMM = /^([01]\d|2[0-3]):([0-5]\d)$/;
const DAY = /^(\d{4})-(\d{2})-(\d{2})$/;
const MS_PER_DAY = 86_400_000;

export type SettingResult<T> = { ok: true; value: T } | { ok: false; message: string };

/**
 * Strict `06:00,14:00,22:00`: 1–6 different `HH:MM` times, returned sorted.
 * @example parseShiftStartList('22:00, 06:00,14:00') // { ok: true, value: ['06:00', '14:00', '22:00'] }
 */
export function parseShiftStartList(text: string): SettingResult<string[]> {
	const parts = text.split(',').map((p) => p.trim());
	if (
		parts.length < 1 ||
		parts.length > 6 ||
		parts.some((p) => !HHMM.test(p)) ||
		new Set(parts).size !== parts.length
	) {
		return {
			ok: false,
			message: `"${text.slice(0, 80)}" must be 1–6 different start times like 06:00,14:00,22:00`
		};
	}
	return { ok: true, value: [...parts].sort() };
}

/**
 * Shift settings from the environment: `SHIFT_STARTS` (default `06:00,14:00,22:00`) and
 * `SITE_TIME_ZONE` (default `UTC`). Unset or blank → the default; malformed → `ok: false`.
 */
export function shiftSettingsFrom(env: {
	SHIFT_STARTS?: string;
	SITE_TIME_ZONE?: string;
}): SettingResult<ShiftSettings> {
	const startsText = env.SHIFT_STARTS?.trim();
	const zone = env.SITE_TIME_ZONE?.trim() || 'UTC';
	const starts = startsText
		? parseShiftStartList(startsText)
		: { ok: true as const, value: [...DEFAULT_SHIFT_STARTS] };
	if (!starts.ok) return { ok: false, message: `SHIFT_STARTS: ${starts.message}` };
	if (!isValidTimeZone(zone)) {
		return {
			ok: false,
			message: `SITE_TIME_ZONE: "${zone.slice(0, 80)}" is not an IANA time zone (e.g. Europe/Berlin)`
		};
	}
	return { ok: true, value: { starts: starts.value, timeZone: zone } };
}

function sortedStarts(settings: ShiftSettings): { text: string; minutes: number }[] {
	const list = [...new Set(settings.starts)].sort().map((text) => {
		if (!HHMM.test(text)) throw new RangeError(`shift start "${text}" is not HH:MM`);
		return { text, minutes: Number(text.slice(0, 2)) * 60 + Number(text.slice(3, 5)) };
	});
	if (list.length === 0) throw new RangeError('no shift starts');
	return list;
}

function dayParts(day: string): { year: number; month: number; day: number } {
	const m = DAY.exec(day);
	if (!m) throw new RangeError(`"${day}" is not a day like 2026-12-03`);
	return { year: +m[1], month: +m[2], day: +m[3] };
}

/** The calendar day `n` days after `day` (both `YYYY-MM-DD`). */
function addDays(day: string, n: number): string {
	const p = dayParts(day);
	return new Date(Date.UTC(p.year, p.month - 1, p.day + n)).toISOString().slice(0, 10);
}

/** The site-local calendar day of an instant. */
export function localDayOf(epochMs: number, timeZone: string): string {
	return new Date(epochMs + timeZoneOffsetMs(timeZone, epochMs)).toISOString().slice(0, 10);
}

function startInstant(day: string, minutes: number, timeZone: string): number {
	const p = dayParts(day);
	return zonedTimeToUtc(
		{
			year: p.year,
			month: p.month,
			day: p.day,
			hour: Math.floor(minutes / 60),
			minute: minutes % 60,
			second: 0,
			millisecond: 0
		},
		timeZone
	);
}

/**
 * The shifts starting on one site-local day, in order; the last runs to the first start of the
 * next day. A start inside a DST gap begins when the clock resumes (02:30 → 03:30); one inside
 * the repeated hour begins the first time the clock shows it.
 * @example shiftsOfDay('2026-12-03', { starts: ['06:00', '18:00'], timeZone: 'UTC' })
 * // [{ key: '2026-12-03 06:00', startMs: Date.UTC(2026, 11, 3, 6), endMs: Date.UTC(2026, 11, 3, 18), … }, …]
 */
export function shiftsOfDay(day: string, settings: ShiftSettings): Shift[] {
	const starts = sortedStarts(settings);
	const next = addDays(day, 1);
	return starts.map((s, index) => {
		const endMs =
			index + 1 < starts.length
				? startInstant(day, starts[index + 1].minutes, settings.timeZone)
				: startInstant(next, starts[0].minutes, settings.timeZone);
		return {
			day,
			start: s.text,
			index,
			key: `${day} ${s.text}`,
			startMs: startInstant(day, s.minutes, settings.timeZone),
			endMs
		};
	});
}

/**
 * The shift an instant falls in (start inclusive, end exclusive).
 * @example shiftOf(new Date('2026-12-04T03:00:00Z'), { starts: ['06:00', '14:00', '22:00'], timeZone: 'UTC' }).key
 * // '2026-12-03 22:00'
 */
export function shiftOf(date: Date | number, settings: ShiftSettings): Shift {
	const t = typeof date === 'number' ? date : date.getTime();
	if (!Number.isFinite(t)) throw new RangeError('shiftOf needs a valid date');
	const today = localDayOf(t, settings.timeZone);
	// The instant lies in a shift that started today or yesterday (site-local).
	for (const day of [today, addDays(today, -1)]) {
		const found = shiftsOfDay(day, settings).find((s) => t >= s.startMs && t < s.endMs);
		if (found) return found;
	}
	// Unreachable for real zones (a local day is never further than one day back); be safe.
	return shiftsOfDay(addDays(today, -2), settings).find((s) => t >= s.startMs && t < s.endMs)!;
}

/** Every shift overlapping [fromMs, toMs), in time order (bounded by the caller's range). */
export function shiftsBetween(fromMs: number, toMs: number, settings: ShiftSettings): Shift[] {
	if (!(toMs > fromMs)) return [];
	if (toMs - fromMs > 400 * MS_PER_DAY) throw new RangeError('at most 400 days of shifts');
	const out: Shift[] = [];
	let day = shiftOf(fromMs, settings).day;
	const lastDay = localDayOf(toMs, settings.timeZone);
	while (day <= lastDay) {
		for (const s of shiftsOfDay(day, settings))
			if (s.endMs > fromMs && s.startMs < toMs) out.push(s);
		day = addDays(day, 1);
	}
	return out;
}
