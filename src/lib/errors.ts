/**
 * The one family of expected refusals. Input that cannot be used, a record that does not exist, a
 * conflict with what is stored, work over its budget: services and pure modules throw a subclass
 * that knows its HTTP status and its answer, and one mapping (`errorResponse` in
 * `$lib/server/api`, `refusalAnswer` below for pages) turns it into a 4xx. Anything that is not a
 * Refusal is a defect: logged, and answered 500 without details.
 */

/** One problem with one field of a request, or one place in a file (`line 7, column 3`). */
export interface FieldProblem {
	field: string;
	message: string;
}

/** The statuses a refusal may carry: client errors and "busy, try again". */
export type RefusalStatus = 400 | 403 | 404 | 409 | 410 | 413 | 415 | 422 | 423 | 429 | 503;

export abstract class Refusal extends Error {
	/** The HTTP status this refusal answers with. */
	abstract readonly status: RefusalStatus;

	/** Field-level problems for forms and the API's `fields` list (none by default). */
	get fieldProblems(): readonly FieldProblem[] {
		return [];
	}

	/**
	 * The JSON body of the API answer: `{ error }`, with `fields` when there are field problems.
	 * A subclass whose API contract has another shape overrides this (and says so).
	 */
	body(): Record<string, unknown> {
		const fields = this.fieldProblems;
		return fields.length > 0 ? { error: this.message, fields } : { error: this.message };
	}
}

/** Is this an expected refusal (answer its status), as opposed to a defect (log, answer 500)? */
export function isRefusal(err: unknown): err is Refusal {
	return err instanceof Refusal;
}

/** What a page shows for a refusal: its status and message, ready for SvelteKit's `error()`. */
export function refusalAnswer(err: Refusal): { status: RefusalStatus; message: string } {
	return { status: err.status, message: err.message };
}
