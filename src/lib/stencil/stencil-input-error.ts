import { Refusal, type FieldProblem } from '../errors';

/**
 * One error format for bad stencil input: every problem names where (aperture, row, index) and
 * which field, then says what is wrong, e.g. `U1.3, widthUm: must be greater than 0 (got -5)`.
 */

/** One problem with one field of one input item. */
export interface InputProblem {
	/** Where: an aperture label such as `U1.3`, `aperture #4`, `line 7` or `stepRegions[2]`. */
	where: string;
	/** Which field or column, e.g. `widthUm` or `corner_radius`. */
	field: string;
	/** What is wrong, in plain words. */
	message: string;
}

/**
 * Format a problem as `<where>, <field>: <message>` (the one message format of this module).
 * @example formatProblem({ where: 'U1.3', field: 'widthUm', message: 'must be > 0' }) // 'U1.3, widthUm: must be > 0'
 */
export function formatProblem(problem: InputProblem): string {
	return `${problem.where}, ${problem.field}: ${problem.message}`;
}

/**
 * Thrown by the computation functions when their input is invalid. `problems` lists every
 * problem found (not only the first) so a UI can show them all. Answered 400 (invalid fields, as
 * the stencil API documents) with `fields: [{ field, message: "<where>, <field>: <what>" }]`.
 * @example
 * try { apertureGeometry(bad); } catch (e) { if (e instanceof StencilInputError) show(e.problems); }
 */
export class StencilInputError extends Refusal {
	readonly status = 400;
	readonly problems: InputProblem[];

	constructor(problems: InputProblem[]) {
		super(problems.map(formatProblem).join('; '));
		this.name = 'StencilInputError';
		this.problems = problems;
	}

	override get fieldProblems(): FieldProblem[] {
		return this.problems.map((p) => ({ field: p.field, message: formatProblem(p) }));
	}
}

/**
 * Describe a number for an error message; shows NaN/Infinity/undefined plainly.
 * @example describeValue(undefined) // 'missing'
 */
export function describeValue(value: unknown): string {
	if (value === undefined || value === null) return 'missing';
	if (typeof value === 'number') return String(value);
	return JSON.stringify(value);
}
