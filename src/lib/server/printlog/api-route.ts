import { json, type RequestEvent } from '@sveltejs/kit';
import type { Actor } from '$lib/access';
import { apiRoute } from '../api';
import { PrintlogRequestError } from './request-error';

/**
 * `apiRoute` for print-log routes: a PrintlogRequestError becomes its status with
 * `{ error, fields, … }`; anything else goes to apiRoute's handling (400 for zod errors).
 */
export const printlogApiRoute = (
	handler: (event: RequestEvent, actor: Actor) => Response | Promise<Response>
) =>
	apiRoute(async (event, actor) => {
		try {
			return await handler(event, actor);
		} catch (err) {
			if (err instanceof PrintlogRequestError) return json(err.body(), { status: err.status });
			throw err;
		}
	});

/** Search parameters as a plain object, blank values dropped. */
export function queryObject(url: URL): Record<string, string> {
	return Object.fromEntries([...url.searchParams].filter(([, v]) => v.trim() !== ''));
}
