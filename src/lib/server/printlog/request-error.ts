import type { FieldError } from '$lib/printlog';
import { formatFieldError } from '$lib/printlog';
import { Refusal } from '$lib/errors';

/**
 * An expected refusal of a print-log request, with the HTTP status the API answers and the
 * field-level problems (`{ field, message }`) a form shows beside its inputs.
 * 404 unknown item, 409 conflict (an open run on the line, a run already ended), 422 a rule
 * refused the values (deviation without a reason, expired lot, quarantined stencil).
 */
export class PrintlogRequestError extends Refusal {
	constructor(
		readonly status: 404 | 409 | 422,
		readonly fields: FieldError[],
		summary?: string,
		readonly extra: Record<string, unknown> = {}
	) {
		super(summary ?? fields.map(formatFieldError).join('; '));
		this.name = 'PrintlogRequestError';
	}

	override get fieldProblems(): readonly FieldError[] {
		return this.fields;
	}

	/** The JSON body of the API answer: `{ error, fields, …extra }`. */
	override body(): Record<string, unknown> {
		return { error: this.message, fields: this.fields, ...this.extra };
	}
}

/** Throw a 422 with these field errors when there are any. */
export function refuseIfAny(fields: FieldError[], summary?: string): void {
	if (fields.length > 0) throw new PrintlogRequestError(422, fields, summary);
}
