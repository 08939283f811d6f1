import { ApiError } from '../api';
import { StencilInputError, formatProblem } from '$lib/stencil';
import { ApertureImportError } from './apertures';
import { DuplicateStencilError, StencilNotFoundError } from './stencils';

/**
 * Turn the stencil feature's expected errors into API answers (404 unknown stencil, 409 duplicate
 * revision, 422 an import refused as a whole, 400 other bad input); anything else is rethrown.
 */
export function toStencilApiError(err: unknown): unknown {
	if (err instanceof StencilNotFoundError) return new ApiError(404, { error: err.message });
	if (err instanceof DuplicateStencilError) return new ApiError(409, { error: err.message });
	if (err instanceof ApertureImportError)
		return new ApiError(422, {
			error: 'The apertures were refused; nothing was imported.',
			errors: err.problems.map((p) => ({
				where: p.where,
				field: p.field,
				message: formatProblem(p)
			}))
		});
	if (err instanceof StencilInputError)
		return new ApiError(400, {
			error: err.message,
			fields: err.problems.map((p) => ({ field: p.field, message: formatProblem(p) }))
		});
	return err;
}

/** Run `fn`, translating stencil errors for `apiRoute`. */
export async function withStencilErrors<T>(fn: () => T | Promise<T>): Promise<T> {
	try {
		return await fn();
	} catch (err) {
		throw toStencilApiError(err);
	}
}
