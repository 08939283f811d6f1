import { Refusal, type FieldProblem } from '../errors';

/**
 * The one error type of the SPC engine: says which input field is wrong and why.
 *
 * Used by every chart, capability and analysis function when input cannot be used, so the
 * API layer answers it 422 with one `{ field, message }` entry (a `Refusal`).
 * The `message` property of the Error is `"<field>: <reason>"`; `reason` alone is kept too.
 *
 * @example
 * throw new SpcInputError('subgroups[3]', 'has 4 values but subgroup 0 has 5');
 */
export class SpcInputError extends Refusal {
	readonly status = 422;
	/** Where the problem is, e.g. `subgroups[3][1]`, `values[7]`, `lsl`. */
	readonly field: string;
	/** What is wrong, without the field prefix. */
	readonly reason: string;

	constructor(field: string, reason: string) {
		super(`${field}: ${reason}`);
		this.name = 'SpcInputError';
		this.field = field;
		this.reason = reason;
	}

	override get fieldProblems(): FieldProblem[] {
		return [{ field: this.field, message: this.reason }];
	}
}
