/**
 * The one error type of the SPC engine: says which input field is wrong and why.
 *
 * Used by every chart, capability and analysis function when input cannot be used, so the
 * API layer can turn it into a `{ field, message }` entry of a 422 answer.
 * The `message` property of the Error is `"<field>: <reason>"`; `reason` alone is kept too.
 *
 * @example
 * throw new SpcInputError('subgroups[3]', 'has 4 values but subgroup 0 has 5');
 */
export class SpcInputError extends Error {
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
}
