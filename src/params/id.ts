import type { ParamMatcher } from '@sveltejs/kit';

/**
 * A record id in a path: a positive whole number that fits SQLite's integer and JavaScript's safe
 * range. A path with anything else (`/stencils/abc`, `/stencils/0`, `/stencils/1e3`) matches no
 * route, so it answers 404 before any load, action or API handler runs.
 */
export const match = ((param: string): boolean =>
	/^[1-9]\d{0,14}$/.test(param)) satisfies ParamMatcher;
