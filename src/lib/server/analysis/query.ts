import { ApiError } from '../api';

/** One refused query field, as the API's 400 body lists them. */
export interface FieldProblem {
	field: string;
	message: string;
}

const MAX_TEXT = 100;
const DAY_MS = 86_400_000;
const DATE_ONLY = /^(\d{4})-(\d{2})-(\d{2})$/;
const DATE_TIME = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,3})?)?(Z|[+-]\d{2}:\d{2})$/;
const DECIMAL = /^[+-]?(\d+(\.\d*)?|\.\d+)$/;

/**
 * Strict reader of a GET query: every value is checked, problems are collected and answered
 * together as 400 `{ error, fields: [{ field, message }] }`. Unknown parameters are refused too,
 * so a misspelt filter never silently widens the answer.
 */
export class QueryReader {
	readonly problems: FieldProblem[] = [];
	constructor(
		private readonly url: URL,
		allowed: readonly string[]
	) {
		for (const key of new Set(url.searchParams.keys())) {
			if (!allowed.includes(key))
				this.problems.push({
					field: key,
					message: `is not a known parameter (${allowed.join(', ')})`
				});
			else if (url.searchParams.getAll(key).length > 1)
				this.problems.push({ field: key, message: 'is given more than once' });
		}
	}

	private raw(name: string): string | null {
		const v = this.url.searchParams.get(name);
		return v === null || v.trim() === '' ? null : v.trim();
	}

	text(name: string, options: { oneOf?: readonly string[] } = {}): string | null {
		const v = this.raw(name);
		if (v === null) return null;
		if (v.length > MAX_TEXT) {
			this.problems.push({ field: name, message: `is longer than ${MAX_TEXT} characters` });
			return null;
		}
		if (options.oneOf && !options.oneOf.includes(v)) {
			this.problems.push({ field: name, message: `must be one of ${options.oneOf.join(', ')}` });
			return null;
		}
		return v;
	}

	integer(name: string, min: number, max: number): number | null {
		const v = this.raw(name);
		if (v === null) return null;
		if (!/^\d{1,9}$/.test(v) || Number(v) < min || Number(v) > max) {
			this.problems.push({ field: name, message: `must be a whole number ${min}–${max}` });
			return null;
		}
		return Number(v);
	}

	decimal(name: string, min: number, max: number, fallback: number): number {
		const v = this.raw(name);
		if (v === null) return fallback;
		const n = DECIMAL.test(v) ? Number(v) : NaN;
		if (!(n > min && n < max)) {
			this.problems.push({ field: name, message: `must be a number between ${min} and ${max}` });
			return fallback;
		}
		return n;
	}

	/**
	 * A date (`2026-03-01`, UTC day) or date-time with a zone, as epoch ms. `end` makes a bare
	 * date mean the end of that day (the next midnight), so `to=2026-03-01` includes the 1st.
	 */
	instant(name: string, end = false): number | null {
		const v = this.raw(name);
		if (v === null) return null;
		const d = DATE_ONLY.exec(v);
		let ms = NaN;
		if (d) {
			ms = Date.UTC(Number(d[1]), Number(d[2]) - 1, Number(d[3]));
			if (new Date(ms).toISOString().slice(0, 10) !== v) ms = NaN;
			else if (end) ms += DAY_MS;
		} else if (DATE_TIME.test(v)) ms = Date.parse(v);
		if (!Number.isFinite(ms)) {
			this.problems.push({
				field: name,
				message: 'must be a date (2026-03-01) or a date-time with a zone (2026-03-01T06:00:00Z)'
			});
			return null;
		}
		return ms;
	}

	/** Throw the collected problems as one 400 answer. */
	finish(): void {
		if (this.problems.length > 0)
			throw new ApiError(400, { error: 'The request has invalid fields.', fields: this.problems });
	}
}

/** from ≤ to when both are given. */
export function checkRange(reader: QueryReader, from: number | null, to: number | null): void {
	if (from !== null && to !== null && from >= to)
		reader.problems.push({ field: 'to', message: 'must be after from' });
}
