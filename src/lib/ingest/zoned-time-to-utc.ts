/**
 * Convert a wall-clock time in an IANA time zone to a UTC instant, using only `Intl` (no tz data
 * of our own). Used for SPI exports whose timestamps carry no UTC offset.
 */

/** Calendar fields of a wall-clock time; `month` is 1–12. */
export interface LocalDateTime {
	year: number;
	month: number;
	day: number;
	hour: number;
	minute: number;
	second: number;
	millisecond: number;
}

/**
 * What to do with a wall time that does not exist (spring-forward gap) or exists twice
 * (fall-back overlap). Same meanings as TC39 Temporal's `disambiguation` option
 * (https://tc39.es/proposal-temporal/docs/timezone.html#ambiguity-due-to-dst-or-other-time-zone-offset-changes):
 * `compatible` = earlier instant in an overlap, shift forward by the gap length in a gap.
 */
export type Disambiguation = 'compatible' | 'earlier' | 'later' | 'reject';

const MS_PER_DAY = 86_400_000;

// Formatters are costly to build (~tens of µs); keep one per zone.
const formatters = new Map<string, Intl.DateTimeFormat>();

function formatterFor(timeZone: string): Intl.DateTimeFormat {
	let f = formatters.get(timeZone);
	if (!f) {
		f = new Intl.DateTimeFormat('en-US', {
			timeZone,
			hourCycle: 'h23',
			year: 'numeric',
			month: 'numeric',
			day: 'numeric',
			hour: 'numeric',
			minute: 'numeric',
			second: 'numeric',
			era: 'short'
		});
		formatters.set(timeZone, f);
	}
	return f;
}

function isUtcZone(timeZone: string): boolean {
	return timeZone === 'UTC' || timeZone === 'Etc/UTC' || timeZone === 'Z';
}

/**
 * Whether `Intl` knows an IANA time zone name.
 * @example isValidTimeZone('Europe/Berlin') // true
 * @example isValidTimeZone('Mars/Olympus') // false
 */
export function isValidTimeZone(timeZone: string): boolean {
	if (isUtcZone(timeZone)) return true;
	try {
		formatterFor(timeZone);
		return true;
	} catch {
		return false;
	}
}

/**
 * UTC offset of `timeZone` at instant `epochMs`, in milliseconds (local − UTC), e.g. +3 600 000
 * for Europe/Berlin in winter. Offsets with seconds (pre-1900 LMT) come out to the second.
 * @throws RangeError for an unknown time zone.
 * @example timeZoneOffsetMs('America/New_York', Date.UTC(2026, 0, 15)) // -18000000
 */
export function timeZoneOffsetMs(timeZone: string, epochMs: number): number {
	if (isUtcZone(timeZone)) return 0;
	// formatToParts has 1 s resolution, so compare whole seconds.
	const wholeSecondMs = Math.floor(epochMs / 1000) * 1000;
	const parts = formatterFor(timeZone).formatToParts(new Date(wholeSecondMs));
	let year = 0;
	let month = 0;
	let day = 0;
	let hour = 0;
	let minute = 0;
	let second = 0;
	let bc = false;
	for (const p of parts) {
		switch (p.type) {
			case 'year':
				year = Number(p.value);
				break;
			case 'month':
				month = Number(p.value);
				break;
			case 'day':
				day = Number(p.value);
				break;
			case 'hour':
				hour = Number(p.value);
				break;
			case 'minute':
				minute = Number(p.value);
				break;
			case 'second':
				second = Number(p.value);
				break;
			case 'era':
				bc = p.value.startsWith('B');
				break;
		}
	}
	if (bc) year = 1 - year;
	const wall = new Date(0);
	wall.setUTCFullYear(year, month - 1, day);
	wall.setUTCHours(hour, minute, second, 0);
	return wall.getTime() - wholeSecondMs;
}

/** Wall-clock fields read as if they were UTC (the "local epoch"). */
function localEpochMs(t: LocalDateTime): number {
	const d = new Date(0);
	d.setUTCFullYear(t.year, t.month - 1, t.day);
	d.setUTCHours(t.hour, t.minute, t.second, t.millisecond);
	return d.getTime();
}

/**
 * Convert a wall-clock time in `timeZone` to epoch milliseconds (UTC).
 *
 * Method (as Temporal's GetPossibleInstantsFor): take the zone's offsets one day before and one
 * day after the wall time; each gives a candidate instant; keep the candidates whose own offset
 * maps back to the same wall time. Two survivors = overlap (fall back), none = gap (spring
 * forward). Assumes at most one offset change within ±1 day, true of all IANA zones in use.
 * Fields are not range-checked here (the timestamp parser does that).
 *
 * @param disambiguation `compatible` (default): overlap → earlier instant; gap → the time moved
 *   forward by the gap length (02:30 in a 02:00→03:00 gap becomes 03:30).
 * @throws RangeError for an unknown time zone, or with `reject` for a gap or overlap time.
 * @example zonedTimeToUtc({ year: 2026, month: 7, day: 1, hour: 12, minute: 0, second: 0, millisecond: 0 }, 'Europe/Berlin')
 * // Date.UTC(2026, 6, 1, 10) = 1782900000000
 */
export function zonedTimeToUtc(
	local: LocalDateTime,
	timeZone: string,
	disambiguation: Disambiguation = 'compatible'
): number {
	const localMs = localEpochMs(local);
	if (isUtcZone(timeZone)) return localMs;
	if (!isValidTimeZone(timeZone)) throw new RangeError(`unknown time zone "${timeZone}"`);
	const offsetBefore = timeZoneOffsetMs(timeZone, localMs - MS_PER_DAY);
	const offsetAfter = timeZoneOffsetMs(timeZone, localMs + MS_PER_DAY);
	const candidateBefore = localMs - offsetBefore;
	const candidateAfter = localMs - offsetAfter;
	const beforeValid = timeZoneOffsetMs(timeZone, candidateBefore) === offsetBefore;
	const afterValid =
		offsetAfter !== offsetBefore && timeZoneOffsetMs(timeZone, candidateAfter) === offsetAfter;
	if (beforeValid && afterValid) {
		if (disambiguation === 'reject') {
			throw new RangeError(`local time ${describe(local)} occurs twice in ${timeZone}`);
		}
		const earlier = Math.min(candidateBefore, candidateAfter);
		const later = Math.max(candidateBefore, candidateAfter);
		return disambiguation === 'later' ? later : earlier;
	}
	if (beforeValid) return candidateBefore;
	if (afterValid) return candidateAfter;
	// Gap: the wall time never happens. Both candidates lie on the "wrong" side of the change.
	if (disambiguation === 'reject') {
		throw new RangeError(`local time ${describe(local)} does not exist in ${timeZone}`);
	}
	const gapMs = offsetAfter - offsetBefore;
	// 'earlier' = the instant just before the gap, moved back by the gap length; compatible/later
	// = read with the pre-change offset, which lands after the gap.
	return disambiguation === 'earlier' ? candidateBefore - gapMs : candidateBefore;
}

function describe(t: LocalDateTime): string {
	const p = (n: number, w = 2) => String(n).padStart(w, '0');
	return `${p(t.year, 4)}-${p(t.month)}-${p(t.day)} ${p(t.hour)}:${p(t.minute)}:${p(t.second)}`;
}
