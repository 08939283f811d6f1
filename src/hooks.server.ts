import {
	json,
	redirect,
	type Handle,
	type HandleServerError,
	type ServerInit
} from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { hasRole, pageRolesFor } from '$lib/access';
import { authHandle } from '$lib/server/auth';
import { getDb, isDatabaseBusy } from '$lib/server/db';
import { apiPolicyFor } from '$lib/server/api-policy';
import { databaseBusy, forbidden, unauthorized } from '$lib/server/api';
import { verifyApiToken } from '$lib/server/tokens';
import { userForSession } from '$lib/server/users';
import { boundRequestBody } from '$lib/server/request-body';
import { startServices } from '$lib/server/startup';
import { securityHeaders } from '$lib/server/security-headers';
import { displayIdentity } from '$lib/server/floor/display-token';

export const init: ServerInit = async () => {
	await startServices();
};

const PUBLIC_PAGES = new Set(['/signin', '/signin/reset']);
const TOKEN_ERRORS = {
	malformed: 'The Bearer token is malformed.',
	unknown: 'The Bearer token is not known.',
	revoked: 'The Bearer token has been revoked.',
	expired: 'The Bearer token has expired.'
} as const;

const isApi = (path: string) => path === '/api' || path.startsWith('/api/');

const FORM_CONTENT_TYPES = [
	'application/x-www-form-urlencoded',
	'multipart/form-data',
	'text/plain'
];
const UNSAFE_METHODS = new Set(['POST', 'PUT', 'PATCH', 'DELETE']);

/**
 * Cross-site form posts are refused, as SvelteKit's own check does, except for API calls that
 * carry a Bearer token: a browser never attaches one by itself, so they cannot be forged.
 */
const crossSiteGuard: Handle = async ({ event, resolve }) => {
	const { request, url } = event;
	const contentType = request.headers.get('content-type')?.split(';')[0].trim().toLowerCase() ?? '';
	const bearer =
		isApi(url.pathname) && /^Bearer\s/i.test(request.headers.get('authorization') ?? '');
	if (
		UNSAFE_METHODS.has(request.method) &&
		FORM_CONTENT_TYPES.includes(contentType) &&
		request.headers.get('origin') !== url.origin &&
		!bearer
	) {
		const message = `Cross-site ${request.method} form submissions are forbidden`;
		return isApi(url.pathname)
			? json({ error: message }, { status: 403 })
			: new Response(message, { status: 403 });
	}
	return resolve(event);
};

/** Work out who is calling: a Bearer token on /api/*, else the signed-in session. */
const identify: Handle = async ({ event, resolve }) => {
	event.locals.actor = null;
	const path = event.url.pathname;
	const authorization = event.request.headers.get('authorization');
	// Wall screens: a viewer token in the query, on the read-only display paths only.
	const display = authorization ? null : displayIdentity(getDb(), path, event.url.searchParams);
	if (display) {
		if ('error' in display) {
			return isApi(path)
				? json({ error: display.error }, { status: 401 })
				: new Response(display.error, { status: 401 });
		}
		event.locals.actor = display.actor;
		return resolve(event);
	}
	if (authorization && isApi(path)) {
		const match = /^Bearer\s+(\S+)\s*$/i.exec(authorization);
		if (!match) {
			return json({ error: 'Expected "Authorization: Bearer <token>".' }, { status: 401 });
		}
		const check = verifyApiToken(getDb(), match[1]);
		if (!check.ok) return json({ error: TOKEN_ERRORS[check.reason] }, { status: 401 });
		event.locals.actor = check.actor;
		return resolve(event);
	}
	if (!path.startsWith('/auth/')) {
		const session = await event.locals.auth();
		// The cookie alone is not enough: its server-side session must still be live.
		const user = session ? userForSession(getDb(), session.sessionId) : undefined;
		if (user) {
			event.locals.actor = {
				kind: 'user',
				id: user.id,
				email: user.email,
				name: user.name,
				role: user.role
			};
		}
	}
	return resolve(event);
};

/** Refuse before the route runs: anonymous callers, wrong roles and oversized bodies. */
const guard: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	const method = event.request.method;
	if (path.startsWith('/auth/') || path.startsWith('/_app/')) return resolve(event);

	const actor = event.locals.actor;
	if (isApi(path)) {
		if (!event.route.id) return json({ error: `No API route at ${path}.` }, { status: 404 });
		const policy = apiPolicyFor(event.route.id, method);
		if (policy === undefined) {
			return json({ error: `${method} is not allowed on ${path}.` }, { status: 405 });
		}
		if (policy !== 'public') {
			if (!actor) return unauthorized();
			if (!hasRole(actor, policy)) return forbidden(actor);
		}
		return resolveWithBoundedBody(event, resolve);
	}

	if (PUBLIC_PAGES.has(path)) return resolveWithBoundedBody(event, resolve);
	if (!actor) {
		const back = path === '/' ? '' : `?redirectTo=${encodeURIComponent(path + event.url.search)}`;
		redirect(303, `/signin${back}`);
	}
	if (!hasRole(actor, pageRolesFor(path)) && method !== 'GET' && method !== 'HEAD') {
		// Page GETs fall through to (app)/+layout.server.ts, which shows a friendly refusal.
		return new Response('Your role may not do this.', { status: 403 });
	}
	return resolveWithBoundedBody(event, resolve);
};

/**
 * Read the body within its route's limit before the route runs (see request-body.ts), once the
 * caller is known to be allowed, so an anonymous client cannot make the server read anything.
 */
async function resolveWithBoundedBody(
	event: Parameters<Handle>[0]['event'],
	resolve: Parameters<Handle>[0]['resolve']
): Promise<Response> {
	const bounded = await boundRequestBody(event.request, event.route.id, isApi(event.url.pathname));
	if (bounded instanceof Response) return bounded;
	event.request = bounded;
	return resolve(event);
}

/** Sign-in posts go to Auth.js before the guards run: bound their bodies first. */
const authBodyLimit: Handle = async ({ event, resolve }) => {
	if (!event.url.pathname.startsWith('/auth/')) return resolve(event);
	return resolveWithBoundedBody(event, resolve);
};

/**
 * Requests whose error was SQLite's busy timeout (another process held the write lock), by their
 * `locals` (the one object every hook and handleError share; the event may be a copy per hook).
 */
const busyRequests = new WeakSet<object>();

/**
 * SQLITE_BUSY anywhere (a hook, a load, an action, an API route) answers 503 + Retry-After, never
 * 500: nothing was written and the request may simply be sent again.
 */
const databaseBusyGuard: Handle = async ({ event, resolve }) => {
	let response: Response;
	try {
		response = await resolve(event);
	} catch (err) {
		if (!isDatabaseBusy(err)) throw err;
		busyRequests.add(event.locals);
		response = new Response(null, { status: 500 });
	}
	if (response.status !== 500 || !busyRequests.has(event.locals)) return response;
	if (isApi(event.url.pathname)) return databaseBusy();
	return new Response('The database is busy with another write; try again in a moment.', {
		status: 503,
		headers: { 'retry-after': '1', 'content-type': 'text/plain; charset=utf-8' }
	});
};

export const handle = sequence(
	securityHeaders,
	databaseBusyGuard,
	crossSiteGuard,
	authBodyLimit,
	authHandle,
	identify,
	guard
);

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	if (isDatabaseBusy(error)) busyRequests.add(event.locals); // answered 503 by databaseBusyGuard
	if (status === 404) return { message: 'This page does not exist.' };
	console.error('[rollbead] unexpected error', error);
	return {
		message: status >= 500 ? 'Something went wrong on our side; it has been logged.' : message
	};
};
