import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';

// Count the argon2 verifications authenticate() makes, without changing what they answer.
vi.mock('./passwords', async (importOriginal) => {
	const real = await importOriginal<typeof import('./passwords')>();
	return { ...real, verifyPassword: vi.fn(real.verifyPassword) };
});

const { verifyPassword } = await import('./passwords');
const { openTestDatabase } = await import('./testing');
const { authenticate, createUser, DUMMY_PASSWORD_HASH, updateUser } = await import('./users');

let db: import('./db').Db;
let close: () => void;
beforeEach(() => {
	({ db, close } = openTestDatabase());
	vi.mocked(verifyPassword).mockClear();
});
afterEach(() => close());

describe('sign-in does the same work whether or not the account exists', () => {
	it('verifies one argon2id hash with the same parameters for unknown, inactive, wrong and right', async () => {
		const user = await createUser(
			db,
			{ email: 'jo@fenmoor.example', name: 'Jo', role: 'viewer', password: 'right password' },
			null
		);
		const calls: string[] = [];
		for (const [email, password] of [
			['nobody@fenmoor.example', 'x'],
			['jo@fenmoor.example', 'wrong'],
			['jo@fenmoor.example', 'right password']
		]) {
			vi.mocked(verifyPassword).mockClear();
			await authenticate(db, email, password);
			expect(verifyPassword).toHaveBeenCalledTimes(1);
			calls.push(vi.mocked(verifyPassword).mock.calls[0][0]);
		}
		updateUser(db, user.id, { active: false }, null);
		vi.mocked(verifyPassword).mockClear();
		expect(await authenticate(db, 'jo@fenmoor.example', 'right password')).toBeNull();
		expect(verifyPassword).toHaveBeenCalledTimes(1);
		expect(vi.mocked(verifyPassword).mock.calls[0][0]).toBe(DUMMY_PASSWORD_HASH);

		expect(calls[0]).toBe(DUMMY_PASSWORD_HASH);
		// The dummy hash has the parameters real hashes get (m, t, p), so it costs the same.
		const params = (h: string) => h.split('$')[3];
		expect(params(DUMMY_PASSWORD_HASH)).toBe(params(calls[1]));
		expect(params(calls[1])).toBe(params(calls[2]));
	});
});
