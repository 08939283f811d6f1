import { SvelteKitAuth } from '@auth/sveltekit';
import Credentials from '@auth/sveltekit/providers/credentials';
import { getRequestEvent } from '$app/server';
import { getDb } from './db';
import { authSecret } from './auth-secret';
import { authenticate, clearSignInFailures, recordSignInFailure, signInLockMinutes } from './users';

/** A shift is about 8–12 h; after that people sign in again. */
const SESSION_MAX_AGE_S = 12 * 60 * 60;

export const { handle: authHandle, signIn, signOut } = SvelteKitAuth(async () => ({
	// @auth/sveltekit ignores AUTH_TRUST_HOST in production builds; adapter-node's ORIGIN already
	// pins the host we answer for.
	trustHost: true,
	secret: authSecret(),
	session: { strategy: 'jwt', maxAge: SESSION_MAX_AGE_S },
	pages: { signIn: '/signin' },
	providers: [
		Credentials({
			credentials: { email: { label: 'E-mail' }, password: { label: 'Password', type: 'password' } },
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
		session({ session, token }) {
			if (token.sub) session.user.id = token.sub;
			return session;
		}
	}
}));

export function clientAddress(): string {
	try {
		return getRequestEvent().getClientAddress();
	} catch {
		return 'unknown';
	}
}
