import { zonedTimeToUtc, type LocalDateTime } from './zoned-time-to-utc';

/** A timestamp read from text: wall-clock fields plus the UTC offset if the text had one. */
export interface ParsedTimestamp {
	local: LocalDateTime;
	/** Offset written in the text in minutes (local − UTC), or null when the text had none. */
	offsetMinutes: number | null;
}

/** A compiled timestamp reader; returns null when the text does not fit. */
export type TimestampReader = (text: string) => ParsedTimestamp | null;

type Op =
	| { kind: 'literal'; text: string }
	| { kind: 'YYYY' | 'MM' | 'DD' | 'HH' | 'hh' | 'mm' | 'ss' | 'SSS' | 'A' | 'Z' };

// Longest tokens first so 'SSS' is not read as literal 'S's and 'MM' before 'mm' is case-exact.
const TOKENS = ['YYYY', 'SSS', 'MM', 'DD', 'HH', 'hh', 'mm', 'ss', 'A', 'Z'] as const;

// ASCII only: `\d` without the `u` flag is [0-9]; only spaces may stand before the offset.
const ISO_PATTERN =
	/^(\d{4})-(\d{2})-(\d{2})[Tt ](\d{2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,9}))?)? *([Zz]|[+-]\d{2}(?::?\d{2})?)?$/;

/**
 * Years an inspection may carry. A year outside is a mapping mistake (a day-month swap, a
 * counter read as a year) rather than a real inspection; the bound also keeps two-digit years
 * away from `Date.UTC`, which reads 0–99 as 1900–1999.
 */
export const TIMESTAMP_YEAR_RANGE = { min: 1970, max: 2100 } as const;
/** Offsets in use on Earth run from UTC−12:00 to UTC+14:00; anything beyond is a typo. */
const MIN_OFFSET_MINUTES = -12 * 60;
const MAX_OFFSET_MINUTES = 14 * 60;

function daysInMonth(year: number, month: number): number {
	return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

function fieldsValid(t: LocalDateTime): boolean {
	return (
		t.year >= TIMESTAMP_YEAR_RANGE.min &&
		t.year <= TIMESTAMP_YEAR_RANGE.max &&
		t.month >= 1 &&
		t.month <= 12 &&
		t.day >= 1 &&
		t.day <= daysInMonth(t.year, t.month) &&
		t.hour >= 0 &&
		t.hour <= 23 &&
		t.minute >= 0 &&
		t.minute <= 59 &&
		t.second >= 0 &&
		t.second <= 59
	);
}

/** Fraction digits → milliseconds, truncated (so .9999 stays in the same second). */
function fractionToMs(digits: string): number {
	return Number((digits + '00').slice(0, 3));
}

/** '+02:00' / '-0530' / '+01' / 'Z' → minutes; NaN when malformed. */
function offsetToMinutes(text: string): number {
	if (text === 'Z' || text === 'z') return 0;
	const m = /^([+-])(\d{2}):?(\d{2})?$/.exec(text);
	if (!m) return NaN;
	const hours = Number(m[2]);
	const minutes = m[3] === undefined ? 0 : Number(m[3]);
	if (minutes > 59) return NaN;
	const offset = (m[1] === '-' ? -1 : 1) * (hours * 60 + minutes);
	return offset < MIN_OFFSET_MINUTES || offset > MAX_OFFSET_MINUTES ? NaN : offset;
}

function readIso(text: string): ParsedTimestamp | null {
	const m = ISO_PATTERN.exec(text);
	if (!m) return null;
	const local: LocalDateTime = {
		year: Number(m[1]),
		month: Number(m[2]),
		day: Number(m[3]),
		hour: Number(m[4]),
		minute: Number(m[5]),
		second: m[6] === undefined ? 0 : Number(m[6]),
		millisecond: m[7] === undefined ? 0 : fractionToMs(m[7])
	};
	if (!fieldsValid(local)) return null;
	const offsetMinutes = m[8] === undefined ? null : offsetToMinutes(m[8]);
	if (offsetMinutes !== null && Number.isNaN(offsetMinutes)) return null;
	return { local, offsetMinutes };
}

function compileOps(pattern: string): Op[] {
	const ops: Op[] = [];
	let literal = '';
	let i = 0;
	while (i < pattern.length) {
		if (pattern[i] === '[') {
			const close = pattern.indexOf(']', i + 1);
			if (close < 0) throw new Error(`timestamp pattern "${pattern}": unclosed "[" at ${i + 1}`);
			literal += pattern.slice(i + 1, close);
			i = close + 1;
			continue;
		}
		const token = TOKENS.find((t) => pattern.startsWith(t, i));
		if (token) {
			if (literal) ops.push({ kind: 'literal', text: literal });
			literal = '';
			ops.push({ kind: token });
			i += token.length;
		} else {
			literal += pattern[i];
			i++;
		}
	}
	if (literal) ops.push({ kind: 'literal', text: literal });
	return ops;
}

/**
 * Compile a timestamp pattern into a reader. Used once per file for `profile.timestampFormat`.
 *
 * Pattern language (Rollbead's own, in the spirit of common date libraries):
 * `YYYY` 4-digit year; `MM` month, `DD` day, `HH` hour 0–23, `hh` hour 1–12 (needs `A`), `mm`
 * minute, `ss` second — each 1 or 2 digits; `SSS` fraction of a second, 1–9 digits, truncated
 * to ms; `A` AM/PM (any case); `Z` offset `Z`, `±HH:mm`, `±HHmm` or `±HH`; `[text]` literal
 * text; any other character is literal. `'iso'` accepts ISO 8601 date-times
 * `YYYY-MM-DD(T| )HH:mm[:ss[.fff]][Z|±HH:mm]`. Calendar ranges are checked (no 31 April, no
 * second 60), years are 1970–2100 (`TIMESTAMP_YEAR_RANGE`), offsets −12:00 to +14:00, digits
 * ASCII only.
 * @throws Error when the pattern lacks a year, month, day, hour or minute, or `hh` lacks `A`.
 * @example compileTimestampPattern('DD.MM.YYYY HH:mm:ss')('02.03.2026 08:05:09')?.local.hour // 8
 */
export function compileTimestampPattern(pattern: string): TimestampReader {
	if (pattern === 'iso') return readIso;
	const ops = compileOps(pattern);
	const kinds = new Set(ops.map((o) => o.kind));
	for (const needed of ['YYYY', 'MM', 'DD', 'mm'] as const) {
		if (!kinds.has(needed)) throw new Error(`timestamp pattern "${pattern}" lacks ${needed}`);
	}
	if (!kinds.has('HH') && !kinds.has('hh')) {
		throw new Error(`timestamp pattern "${pattern}" lacks HH or hh`);
	}
	if (kinds.has('hh') !== kinds.has('A')) {
		throw new Error(`timestamp pattern "${pattern}": hh (12-hour) and A (AM/PM) go together`);
	}
	return (text) => readWithOps(ops, text);
}

function readDigits(text: string, at: number, min: number, max: number): number {
	let end = at;
	while (end < text.length && end - at < max) {
		const c = text.charCodeAt(end);
		if (c < 48 || c > 57) break;
		end++;
	}
	return end - at >= min ? end : -1;
}

function readWithOps(ops: Op[], text: string): ParsedTimestamp | null {
	const t: LocalDateTime = {
		year: 0,
		month: 0,
		day: 0,
		hour: 0,
		minute: 0,
		second: 0,
		millisecond: 0
	};
	let offsetMinutes: number | null = null;
	let pm: boolean | null = null;
	let hour12 = -1;
	let at = 0;
	for (const op of ops) {
		if (op.kind === 'literal') {
			if (!text.startsWith(op.text, at)) return null;
			at += op.text.length;
			continue;
		}
		if (op.kind === 'A') {
			const word = text.slice(at, at + 2).toUpperCase();
			if (word !== 'AM' && word !== 'PM') return null;
			pm = word === 'PM';
			at += 2;
			continue;
		}
		if (op.kind === 'Z') {
			const m = /^(?:[Zz]|[+-]\d{2}(?::?\d{2})?)/.exec(text.slice(at));
			if (!m) return null;
			offsetMinutes = offsetToMinutes(m[0]);
			if (Number.isNaN(offsetMinutes)) return null;
			at += m[0].length;
			continue;
		}
		const end =
			op.kind === 'YYYY'
				? readDigits(text, at, 4, 4)
				: op.kind === 'SSS'
					? readDigits(text, at, 1, 9)
					: readDigits(text, at, 1, 2);
		if (end < 0) return null;
		const digits = text.slice(at, end);
		at = end;
		const n = Number(digits);
		if (op.kind === 'YYYY') t.year = n;
		else if (op.kind === 'MM') t.month = n;
		else if (op.kind === 'DD') t.day = n;
		else if (op.kind === 'HH') t.hour = n;
		else if (op.kind === 'hh') hour12 = n;
		else if (op.kind === 'mm') t.minute = n;
		else if (op.kind === 'ss') t.second = n;
		else t.millisecond = fractionToMs(digits);
	}
	if (at !== text.length) return null;
	if (hour12 !== -1) {
		if (hour12 < 1 || hour12 > 12) return null;
		t.hour = (hour12 % 12) + (pm ? 12 : 0);
	}
	return fieldsValid(t) ? { local: t, offsetMinutes } : null;
}

/**
 * Build a function text → epoch ms (UTC) for a profile's format and time zone; NaN when the text
 * does not fit. A timestamp with an offset uses it; one without is read in `timeZone`
 * (`zonedTimeToUtc`, `compatible` rule at DST changes). Caches the last text, since every pad
 * row of a board repeats the same timestamp.
 * @throws Error for a bad pattern (see `compileTimestampPattern`).
 * @example createTimestampParser('iso', 'UTC')('2026-03-02T08:00:00Z') // 1772438400000
 */
export function createTimestampParser(format: string, timeZone: string): (text: string) => number {
	const read = compileTimestampPattern(format);
	let lastText = '';
	let lastMs = NaN;
	return (text) => {
		if (text === lastText) return lastMs;
		// Only ASCII spaces are trimmed: a no-break space or a tab is not padding in a strict file.
		let from = 0;
		let to = text.length;
		while (from < to && text.charCodeAt(from) === 32) from++;
		while (to > from && text.charCodeAt(to - 1) === 32) to--;
		const parsed = read(from === 0 && to === text.length ? text : text.slice(from, to));
		let ms = NaN;
		if (parsed) {
			if (parsed.offsetMinutes === null) {
				ms = zonedTimeToUtc(parsed.local, timeZone);
			} else {
				const l = parsed.local;
				const d = new Date(0);
				d.setUTCFullYear(l.year, l.month - 1, l.day);
				d.setUTCHours(l.hour, l.minute, l.second, l.millisecond);
				ms = d.getTime() - parsed.offsetMinutes * 60_000;
			}
		}
		lastText = text;
		lastMs = ms;
		return ms;
	};
}
