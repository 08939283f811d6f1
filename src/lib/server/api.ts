import {
	isHttpError,
	isRedirect,
	json,
	type RequestEvent,
	type RequestHandler
} from '@sveltejs/kit';
import { ZodError, type ZodType } from 'zod';
import { hasRole, type Actor } from '$lib/access';
import { apiPolicyFor } from './api-policy';
import { jsonTooDeep, MAX_JSON_DEPTH } from '$lib/json/json-depth';
import { isDatabaseBusy } from './db';
import { isRefusal, Refusal, type FieldProblem, type RefusalStatus } from '$lib/errors';

/**
 * A refusal whose answer a route words on the spot: its status and the JSON body as given (for a
 * refusal with a name of its own, extend `Refusal` instead). The message is the body's `error`.
 */
export class ApiError extends Refusal {
	readonly status: RefusalStatus;
	readonly #body: Record<string, unknown>;

	constructor(status: RefusalStatus, body: Record<string, unknown>) {
		super(String(body.error ?? body.message ?? status));
		this.status = status;
		this.#body = body;
	}

	/** The body's `fields`, when it lists them in the `{ field, message }` shape. */
	override get fieldProblems(): readonly FieldProblem[] {
		const fields = this.#body.fields;
		return Array.isArray(fields) ? (fields as FieldProblem[]) : [];
	}

	override body(): Record<string, unknown> {
		return this.#body;
	}
}

export const unauthorized = () =>
	json(
		{ error: 'Sign-in required: send "Authorization: Bearer <token>" or use a signed-in session.' },
		{ status: 401 }
	);

export const forbidden = (actor: Actor) =>
	json({ error: `The role "${actor.role}" may not use this route.` }, { status: 403 });

/** 503 + Retry-After: another process held the database's write lock longer than the busy timeout. */
export const databaseBusy = () =>
	json(
		{ error: 'The database is busy with another write; try again in a moment.' },
		{ status: 503, headers: { 'retry-after': '1' } }
	);

type Handler<A> = (event: RequestEvent, actor: A) => Response | Promise<Response>;

function wrap<A extends Actor | null>(handler: Handler<A>, needsActor: boolean): RequestHandler {
	return async (event) => {
		const policy = apiPolicyFor(event.route.id, event.request.method);
		if (policy === undefined) {
			return json(
				{ error: 'This route declares no access policy for that method.' },
				{ status: 405 }
			);
		}
		const actor = event.locals.actor;
		if (policy !== 'public' || needsActor) {
			if (!actor) return unauthorized();
			if (policy !== 'public' && !hasRole(actor, policy)) return forbidden(actor);
		}
		try {
			return await handler(event, actor as A);
		} catch (err) {
			return errorResponse(err);
		}
	};
}

/** A JSON route for signed-in callers (session or token); roles come from API_POLICY. */
export const apiRoute = (handler: Handler<Actor>) => wrap(handler, true);

/** A JSON route that answers without credentials. */
export const publicApiRoute = (handler: Handler<Actor | null>) => wrap(handler, false);

/** Turn anything thrown by a handler into a JSON answer; unexpected errors are logged, not shown. */
export function errorResponse(err: unknown): Response {
	if (isRefusal(err)) return json(err.body(), { status: err.status });
	if (err instanceof ZodError) return json(validationBody(err), { status: 400 });
	if (isRedirect(err)) throw err;
	if (isHttpError(err)) return json({ error: err.body.message }, { status: err.status });
	if (err && typeof err === 'object' && 'status' in err && err.status === 413) {
		return json({ error: String((err as { message?: unknown }).message) }, { status: 413 });
	}
	if (isDatabaseBusy(err)) return databaseBusy();
	console.error('[api] unexpected error', err);
	return json({ error: 'Internal error; it has been logged.' }, { status: 500 });
}

export function validationBody(err: ZodError) {
	return {
		error: 'The request has invalid fields.',
		fields: err.issues.map((issue) => ({
			field: issue.path.map(String).join('.') || '(body)',
			message: issue.message
		}))
	};
}

/** Read a JSON body, answering 400 with a clear message when it is not JSON or nests too deep. */
export async function readJson(request: Request): Promise<unknown> {
	let text: string;
	try {
		text = await request.text();
	} catch {
		throw new ApiError(400, { error: 'The request body could not be read.' });
	}
	return parseJsonText(text);
}

/** Parse a JSON request body (400 naming the problem); nesting is limited to MAX_JSON_DEPTH. */
export function parseJsonText(text: string): unknown {
	const deep = jsonTooDeep(text);
	if (deep) {
		throw new ApiError(400, {
			error: `The request body nests deeper than ${MAX_JSON_DEPTH} levels (at character ${deep.at}).`
		});
	}
	try {
		return JSON.parse(text);
	} catch {
		throw new ApiError(400, { error: 'The request body is not valid JSON.' });
	}
}

/** Parse and validate a JSON body against a zod schema (400 with field messages on failure). */
export async function parseJsonBody<T>(request: Request, schema: ZodType<T>): Promise<T> {
	const result = schema.safeParse(await readJson(request));
	if (!result.success) throw result.error;
	return result.data;
}
