import { SvelteKitAuth } from '@auth/sveltekit';
import Credentials from '@auth/sveltekit/providers/credentials';
import type { Handle } from '@sveltejs/kit';
import { getRequestEvent } from '$app/server';
import { getDb } from './db';
import { authSecret } from './auth-secret';
import { authenticate, clearSignInFailures, recordSignInFailure, signInLockMinutes } from './users';
import { createSession, endSession, sessionTimeouts } from './sessions';
import { sameOriginUrl } from './safe-redirect';

const auth = SvelteKitAuth(async () => ({
	// @auth/sveltekit ignores AUTH_TRUST_HOST in production builds; pinOrigin (below) rewrites the
	// Host and X-Forwarded-* headers to ORIGIN before Auth.js reads them.
	trustHost: true,
	secret: authSecret(),
	// The cookie lives as long as the absolute timeout; the sessions table decides before that.
	session: { strategy: 'jwt', maxAge: Math.ceil(sessionTimeouts().absoluteMs / 1000) },
	pages: { signIn: '/signin' },
	providers: [
		Credentials({
			credentials: {
				email: { label: 'E-mail' },
				password: { label: 'Password', type: 'password' }
			},
			async authorize(credentials) {
				const email = typeof credentials?.email === 'string' ? credentials.email : '';
				const password = typeof credentials?.password === 'string' ? credentials.password : '';
				if (!email || !password || email.length > 254 || password.length > 1024) return null;
				const db = getDb();
				const ip = clientAddress();
				// Checked here too, so posting straight to the Auth.js callback cannot skip it.
				if (signInLockMinutes(db, email, ip) > 0) return null;
				const user = await authenticate(db, email, password);
				if (!user) {
					recordSignInFailure(db, email, ip);
					return null;
				}
				clearSignInFailures(db, email, ip);
				return { id: String(user.id), email: user.email, name: user.name };
			}
		})
	],
	callbacks: {
		jwt({ token, user }) {
			// Only at sign-in: a server-side session the cookie names, so the server can end it.
			if (user?.id) token.sid = createSession(getDb(), Number(user.id));
			return token;
		},
		session({ session, token }) {
			if (token.sub) session.user.id = token.sub;
			session.sessionId = typeof token.sid === 'string' ? token.sid : undefined;
			return session;
		},
		// Every redirect Auth.js makes goes to a path on ORIGIN, whatever the request said.
		redirect({ url }) {
			return sameOriginUrl(url, appOrigin());
		}
	},
	events: {
		signOut(message) {
			if ('token' in message) endSession(getDb(), message.token?.sid);
		}
	}
}));

export const { signIn, signOut } = auth;

/**
 * Auth.js builds its own URLs (redirects, error pages, the secure-cookie choice) from the Host
 * and X-Forwarded-Host/-Proto headers. Rewrite them to the origin SvelteKit answers for (adapter-
 * node's ORIGIN), so a forged header cannot steer a redirect to another site.
 */
const pinOrigin: Handle = ({ event, resolve }) => {
	const { url, request } = event;
	const headers = request.headers;
	const forwarded = headers.has('x-forwarded-host') || headers.has('x-forwarded-proto');
	if (forwarded || headers.get('host') !== url.host) {
		const pinned = new Headers(headers);
		pinned.set('host', url.host);
		pinned.delete('x-forwarded-host');
		pinned.delete('x-forwarded-proto');
		event.request = new Request(request, { headers: pinned });
	}
	return resolve(event);
};

export const authHandle: Handle = ({ event, resolve }) =>
	pinOrigin({ event, resolve: (e) => auth.handle({ event: e, resolve }) });

/** The origin links and redirects are built from: ORIGIN, as adapter-node reads it. */
export function appOrigin(): string {
	const configured = process.env.ORIGIN?.trim();
	if (configured) {
		try {
			return new URL(configured).origin;
		} catch {
			// fall through to the request's own origin, which adapter-node built from ORIGIN anyway
		}
	}
	return getRequestEvent().url.origin;
}

export function clientAddress(): string {
	try {
		return getRequestEvent().getClientAddress();
	} catch {
		return 'unknown';
	}
}
