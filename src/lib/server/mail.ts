import nodemailer, { type Transporter } from 'nodemailer';
import { desc, eq } from 'drizzle-orm';
import type { Db } from './db';
import { mailOutbox } from './db/schema';

export type OutgoingMail = { to: string[]; subject: string; text: string; kind?: string };

const FROM = () => process.env.MAIL_FROM ?? 'Rollbead <rollbead@localhost>';

let transport: Transporter | null | undefined;

/** SMTP when `SMTP_URL` is set; otherwise null, and mail is only kept in the outbox table. */
function smtpTransport(): Transporter | null {
	if (transport === undefined) {
		const url = process.env.SMTP_URL?.trim();
		transport = url ? nodemailer.createTransport(url) : null;
	}
	return transport;
}

/** Forget the cached transport (tests that change SMTP_URL). */
export function resetMailTransport(): void {
	transport = undefined;
}

/**
 * Send a message. Every message is written to the outbox first, so a record exists whatever SMTP
 * does; with SMTP configured the row then says whether the server accepted it.
 */
export async function sendMail(db: Db, mail: OutgoingMail): Promise<number> {
	const smtp = smtpTransport();
	const row = db
		.insert(mailOutbox)
		.values({
			toAddresses: mail.to.join(', '),
			subject: mail.subject,
			textBody: mail.text,
			kind: mail.kind ?? 'general',
			status: 'stored'
		})
		.returning({ id: mailOutbox.id })
		.get();
	if (!smtp || mail.to.length === 0) return row.id;
	try {
		await smtp.sendMail({ from: FROM(), to: mail.to, subject: mail.subject, text: mail.text });
		db.update(mailOutbox)
			.set({ status: 'sent', sentAt: new Date() })
			.where(eq(mailOutbox.id, row.id))
			.run();
	} catch (err) {
		db.update(mailOutbox)
			.set({ status: 'failed', error: (err as Error).message })
			.where(eq(mailOutbox.id, row.id))
			.run();
	}
	return row.id;
}

export function listOutbox(db: Db, limit = 200) {
	return db.select().from(mailOutbox).orderBy(desc(mailOutbox.id)).limit(limit).all();
}
