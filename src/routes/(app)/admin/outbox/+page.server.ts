import { ADMIN_ONLY } from '$lib/access';
import { getDb } from '$lib/server/db';
import { requireActor } from '$lib/server/guards';
import { listOutbox } from '$lib/server/mail';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => {
	requireActor(locals, ADMIN_ONLY);
	return { mails: listOutbox(getDb()), smtpConfigured: Boolean(process.env.SMTP_URL) };
};
