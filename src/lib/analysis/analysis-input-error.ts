/** Input the analysis modules cannot use (lengths differ, non-finite values, too few points). */
export class AnalysisInputError extends Error {
	constructor(message: string) {
		super(message);
		this.name = 'AnalysisInputError';
	}
}
