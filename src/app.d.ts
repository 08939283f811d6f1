import type { Actor } from '$lib/access';

declare global {
	namespace App {
		interface Error {
			message: string;
		}
		interface Locals {
			/** Who the request acts as: a signed-in user or an API token; null when anonymous. */
			actor: Actor | null;
		}
		interface Platform {
			req?: import('node:http').IncomingMessage;
		}
	}
}

declare module '@auth/core/types' {
	interface Session {
		user: { id: string; email?: string | null; name?: string | null };
		/** The server-side session the cookie names (see $lib/server/sessions). */
		sessionId?: string;
	}
}

declare module '@auth/core/jwt' {
	interface JWT {
		sid?: string;
	}
}

export {};
