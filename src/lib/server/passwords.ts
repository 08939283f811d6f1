import { hash, verify } from '@node-rs/argon2';

/** Argon2id with the library defaults (m=19456 KiB, t=2, p=1: the OWASP minimum profile). */
export function hashPassword(password: string): Promise<string> {
	return hash(password);
}

/** True when the password matches; a malformed stored hash counts as a mismatch. */
export async function verifyPassword(storedHash: string, password: string): Promise<boolean> {
	try {
		return await verify(storedHash, password);
	} catch {
		return false;
	}
}
