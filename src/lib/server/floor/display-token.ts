import type { Actor } from '$lib/access';
import type { Db } from '../db';
import { verifyApiToken } from '../tokens';

/**
 * Wall screens open `/wall?token=…` with an API token of role viewer: a display cannot sign in
 * and an EventSource cannot send an Authorization header, so on these read-only paths (the wall
 * page, the overview JSON and the stream) the token may come in the query. Only viewer tokens are
 * taken there (a token in a URL ends up in histories and logs; it must not be able to change
 * anything); every other path still wants the Authorization header.
 */
export const DISPLAY_TOKEN_PATHS: ReadonlySet<string> = new Set([
	'/wall',
	'/api/lines/overview',
	'/api/lines/stream'
]);

export type DisplayIdentity = { actor: Actor } | { error: string } | null;

/**
 * The actor of a display token on a display path, an error (unknown, revoked or not a viewer
 * token), or null when the request carries no display token.
 * @example displayIdentity(db, '/wall', new URLSearchParams('token=rb_…'))
 */
export function displayIdentity(db: Db, path: string, query: URLSearchParams): DisplayIdentity {
	if (!DISPLAY_TOKEN_PATHS.has(path)) return null;
	const token = query.get('token');
	if (token === null) return null;
	const check = verifyApiToken(db, token.trim());
	if (!check.ok)
		return {
			error: `The display token is ${check.reason === 'unknown' ? 'not known' : check.reason}.`
		};
	if (check.actor.role !== 'viewer') {
		return { error: 'A display token must be an API token of role viewer (read-only).' };
	}
	return { actor: check.actor };
}
