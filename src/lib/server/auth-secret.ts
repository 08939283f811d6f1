import { randomBytes } from 'node:crypto';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { databasePath } from './db';

/**
 * The secret that signs session cookies. `AUTH_SECRET` wins; otherwise one is generated on first
 * start and kept beside the database (mode 600), so `npm start` works with no configuration and
 * sessions survive restarts.
 */
export function authSecret(): string {
	const fromEnv = process.env.AUTH_SECRET?.trim();
	if (fromEnv) return fromEnv;
	const file = join(dirname(databasePath()), 'auth-secret');
	if (existsSync(file)) {
		const stored = readFileSync(file, 'utf8').trim();
		if (stored.length >= 32) return stored;
	}
	const secret = randomBytes(32).toString('base64url');
	writeFileSync(file, secret + '\n', { mode: 0o600 });
	return secret;
}
