import { error, fail } from '@sveltejs/kit';
import { isRefusal } from '$lib/errors';

/**
 * In a form action: a refusal becomes `fail(status, { ...extra, field, error })` (the first field
 * it names, its message); anything else is rethrown (a defect: logged, 500).
 * @example catch (err) { return refusalToFail(err, { action: 'freeze' }); }
 */
export function refusalToFail<T extends Record<string, unknown>>(err: unknown, extra: T) {
	if (!isRefusal(err)) throw err;
	return fail(err.status, { ...extra, field: err.fieldProblems[0]?.field, error: err.message });
}

/**
 * In a load or action: a refusal becomes SvelteKit's `error(status, message)` (e.g. 404 for an
 * unknown id); anything else is rethrown.
 */
export function refusalToError(err: unknown): never {
	if (isRefusal(err)) error(err.status, err.message);
	throw err;
}
