import { requireActor } from '$lib/server/guards';
import type { PageServerLoad } from './$types';

function whole(value: string | null, fallback: number, min: number, max: number): number {
	const n = Number(value);
	return value !== null && Number.isInteger(n) && n >= min && n <= max ? n : fallback;
}

/**
 * The wall screen: signed in, or opened with `?token=` (a viewer API token, checked in hooks).
 * `per` tiles per page (default 6) and `rotate` seconds per page (default 20) when there are more.
 */
export const load: PageServerLoad = ({ locals, url }) => {
	const actor = requireActor(locals);
	return {
		// Handed back to the page only when the token is what identified the caller.
		token: actor.kind === 'token' ? url.searchParams.get('token') : null,
		perPage: whole(url.searchParams.get('per'), 6, 1, 60),
		rotateSeconds: whole(url.searchParams.get('rotate'), 20, 5, 600)
	};
};
