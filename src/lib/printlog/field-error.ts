/**
 * One error format for the print log: every problem names the field by its path in the payload
 * (dots and indexes, e.g. `parameters.squeegeeAngleDeg.max` or `events[3].event`) and says what
 * is wrong with the offending value, e.g. `parameters.squeegeeAngleDeg.max: must be ≥ target (60)`.
 */

import { Refusal } from '../errors';

/** One problem with one field. `field` is the path in the payload, as the API and forms use it. */
export interface FieldError {
	/** Path of the field, e.g. `parameters.squeegeeSpeedMmS` or `events[2].at`. */
	field: string;
	/** What is wrong, in plain words, quoting the offending value. */
	message: string;
}

/**
 * Format a field error as `<field>: <message>` (the one message format of this module).
 * @example formatFieldError({ field: 'lotNumber', message: 'must not be blank' }) // 'lotNumber: must not be blank'
 */
export function formatFieldError(error: FieldError): string {
	return `${error.field}: ${error.message}`;
}

/**
 * Thrown by print-log functions whose input is unusable (e.g. an unparseable timestamp).
 * `errors` lists every problem found, so a form can show them all at once.
 * @example
 * try { toEpochMs('yesterday', 'at'); } catch (e) { if (e instanceof PrintlogInputError) show(e.errors); }
 */
export class PrintlogInputError extends Refusal {
	readonly status = 422;
	readonly errors: FieldError[];

	constructor(errors: FieldError[]) {
		super(errors.map(formatFieldError).join('; '));
		this.name = 'PrintlogInputError';
		this.errors = errors;
	}

	override get fieldProblems(): readonly FieldError[] {
		return this.errors;
	}
}

/**
 * Describe a value for an error message: `missing` for undefined/null, numbers as written
 * (NaN and Infinity stay readable), everything else as JSON.
 * @example describeValue(Number.NaN) // 'NaN'
 */
export function describeValue(value: unknown): string {
	if (value === undefined || value === null) return 'missing';
	if (typeof value === 'number') return String(value);
	if (value instanceof Date) {
		return Number.isNaN(value.getTime()) ? 'Invalid Date' : value.toISOString();
	}
	return JSON.stringify(value);
}
