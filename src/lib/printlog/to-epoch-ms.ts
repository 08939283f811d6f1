import { describeValue, PrintlogInputError } from './field-error';

/** A point in time as the print log accepts it: a Date, epoch ms or an ISO 8601 string. */
export type Instant = Date | number | string;

/** ISO 8601 date (`2026-03-01`) or date-time with `Z` or offset (`2026-03-01T08:00:00+01:00`). */
const ISO_INSTANT =
	/^\d{4}-\d{2}-\d{2}(?:T\d{2}:\d{2}(?::\d{2}(?:\.\d{1,3})?)?(?:Z|[+-]\d{2}:\d{2}))?$/i;

/**
 * Convert an instant to epoch milliseconds, naming the field in the error when it cannot be read.
 * Strings must be ISO 8601 with a zone (`Z` or an offset), or a bare date (taken as 00:00 UTC);
 * a date-time without a zone is refused because the tablet's and server's clocks may differ.
 * @throws {PrintlogInputError} when the value is not a valid instant.
 * @example toEpochMs('2026-03-01T00:00:00Z', 'at') // 1772323200000
 */
export function toEpochMs(value: Instant, field: string): number {
	let ms: number;
	if (value instanceof Date) ms = value.getTime();
	else if (typeof value === 'number') ms = value;
	else if (typeof value === 'string' && isIsoInstant(value.trim())) ms = Date.parse(value.trim());
	else ms = Number.NaN;
	if (!Number.isFinite(ms)) {
		throw new PrintlogInputError([
			{
				field,
				message: `must be an ISO 8601 date or date-time with a time zone (got ${describeValue(value)})`
			}
		]);
	}
	return ms;
}

/** ISO form with a zone, on a real calendar day (Date.parse would roll 02-30 into March). */
function isIsoInstant(text: string): boolean {
	if (!ISO_INSTANT.test(text)) return false;
	const [year, month, day] = text.slice(0, 10).split('-').map(Number);
	const date = new Date(Date.UTC(year, month - 1, day));
	return (
		date.getUTCFullYear() === year && date.getUTCMonth() === month - 1 && date.getUTCDate() === day
	);
}
