import { ApiError } from '$lib/server/api';
import { CfxInputError } from './store';

/** Run a CFX service call, turning its input errors into JSON answers naming the field. */
export async function cfxCall<T>(fn: () => T | Promise<T>): Promise<T> {
	try {
		return await fn();
	} catch (err) {
		if (err instanceof CfxInputError) {
			throw new ApiError(err.status, {
				error: err.message,
				fields: [{ field: err.field, message: err.message }]
			});
		}
		throw err;
	}
}
