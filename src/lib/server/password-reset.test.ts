import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from './testing';
import {
	forgetResetThrottle,
	requestPasswordReset,
	RESET_LINK_TTL_MS,
	RESET_MAX_PER_ACCOUNT,
	RESET_MAX_PER_IP,
	resetLinkUsable,
	resetPassword,
	ResetLinkError
} from './password-reset';
import { authenticate, createUser, updateUser, userForSession } from './users';
import { createSession } from './sessions';
import { mailOutbox, passwordResets } from './db/schema';
import type { Db } from './db';

let db: Db;
let close: () => void;
beforeEach(() => {
	({ db, close } = openTestDatabase());
	forgetResetThrottle();
	delete process.env.SMTP_URL;
});
afterEach(() => close());

const ORIGIN = 'https://rollbead.fenmoor.example';
const linkIn = (text: string) =>
	/\/signin\/reset\?token=([A-Za-z0-9_-]{43})/.exec(text)?.[1] ?? null;

async function person() {
	return createUser(
		db,
		{ email: 'kit@fenmoor.example', name: 'Kit', role: 'viewer', password: 'old long password' },
		null
	);
}

describe('password reset by mail', () => {
	it('mails a link on ORIGIN that works once and ends every session', async () => {
		const user = await person();
		const session = createSession(db, user.id);
		expect(await requestPasswordReset(db, 'KIT@fenmoor.example ', '10.0.0.1', ORIGIN)).toBe('sent');
		const mail = db.select().from(mailOutbox).get()!;
		expect(mail.toAddresses).toBe('kit@fenmoor.example');
		expect(mail.textBody).toContain(`${ORIGIN}/signin/reset?token=`);
		const token = linkIn(mail.textBody)!;
		expect(JSON.stringify(db.select().from(passwordResets).all())).not.toContain(token);
		expect(resetLinkUsable(db, token)).toBe(true);

		await resetPassword(db, token, 'new long password');
		expect((await authenticate(db, 'kit@fenmoor.example', 'new long password'))?.id).toBe(user.id);
		expect(userForSession(db, session)).toBeUndefined();
		expect(resetLinkUsable(db, token)).toBe(false);
		await expect(resetPassword(db, token, 'third long password')).rejects.toThrow(ResetLinkError);
	});

	it('refuses a link after 30 minutes, and spends the older links when one is used', async () => {
		await person();
		const t0 = Date.UTC(2026, 5, 1, 8);
		await requestPasswordReset(db, 'kit@fenmoor.example', '10.0.0.1', ORIGIN, t0);
		await requestPasswordReset(db, 'kit@fenmoor.example', '10.0.0.1', ORIGIN, t0 + 60_000);
		const [first, second] = db
			.select()
			.from(mailOutbox)
			.all()
			.map((m) => linkIn(m.textBody)!);
		expect(resetLinkUsable(db, first, t0 + RESET_LINK_TTL_MS - 1)).toBe(true);
		expect(resetLinkUsable(db, first, t0 + RESET_LINK_TTL_MS)).toBe(false);
		await expect(
			resetPassword(db, first, 'new long password', t0 + RESET_LINK_TTL_MS + 1)
		).rejects.toThrow(ResetLinkError);
		await resetPassword(db, second, 'new long password', t0 + 120_000);
		expect(resetLinkUsable(db, first, t0 + 180_000)).toBe(false);
	});

	it('sends nothing for unknown or deactivated addresses, and throttles per account and per client', async () => {
		const user = await person();
		expect(await requestPasswordReset(db, 'nobody@fenmoor.example', '10.0.0.1', ORIGIN)).toBe(
			'unknown'
		);
		for (let i = 0; i < RESET_MAX_PER_ACCOUNT; i++) {
			expect(await requestPasswordReset(db, 'kit@fenmoor.example', '10.0.0.2', ORIGIN)).toBe(
				'sent'
			);
		}
		expect(await requestPasswordReset(db, 'kit@fenmoor.example', '10.0.0.3', ORIGIN)).toBe(
			'throttled'
		);
		expect(db.select().from(mailOutbox).all()).toHaveLength(RESET_MAX_PER_ACCOUNT);

		for (let i = 0; i < RESET_MAX_PER_IP; i++) {
			await requestPasswordReset(db, `x${i}@fenmoor.example`, '10.0.0.9', ORIGIN);
		}
		expect(await requestPasswordReset(db, 'anyone@fenmoor.example', '10.0.0.9', ORIGIN)).toBe(
			'throttled'
		);

		updateUser(db, user.id, { active: false }, null);
		forgetResetThrottle();
		expect(
			await requestPasswordReset(
				db,
				'kit@fenmoor.example',
				'10.0.0.4',
				ORIGIN,
				Date.now() + 2 * 3_600_000
			)
		).toBe('unknown');
	});
});
