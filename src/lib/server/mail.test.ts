import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from './testing';
import { listOutbox, resetMailTransport, sendMail } from './mail';
import type { Db } from './db';

let db: Db;
let close: () => void;
beforeEach(() => {
	({ db, close } = openTestDatabase());
	resetMailTransport();
});
afterEach(() => {
	delete process.env.SMTP_URL;
	resetMailTransport();
	close();
});

describe('mail', () => {
	it('without SMTP_URL keeps the message in the outbox', async () => {
		delete process.env.SMTP_URL;
		await sendMail(db, {
			to: ['eng@fenmoor.example'],
			subject: 'Signal on SMT-1',
			text: 'Rule we-1',
			kind: 'signal'
		});
		const [mail] = listOutbox(db);
		expect(mail).toMatchObject({
			toAddresses: 'eng@fenmoor.example',
			subject: 'Signal on SMT-1',
			textBody: 'Rule we-1',
			kind: 'signal',
			status: 'stored'
		});
	});

	it('records an SMTP failure on the outbox row instead of throwing', async () => {
		// Port 9 on loopback has no SMTP server: the connection is refused.
		process.env.SMTP_URL = 'smtp://127.0.0.1:9';
		await sendMail(db, { to: ['eng@fenmoor.example'], subject: 'x', text: 'y' });
		const [mail] = listOutbox(db);
		expect(mail.status).toBe('failed');
		expect(mail.error).toMatch(/ECONNREFUSED|connect/i);
	});
});
