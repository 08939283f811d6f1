import { Refusal } from '../errors';

/** Input the analysis modules cannot use (lengths differ, non-finite values, too few points): 422. */
export class AnalysisInputError extends Refusal {
	readonly status = 422;
	constructor(message: string) {
		super(message);
		this.name = 'AnalysisInputError';
	}
}
