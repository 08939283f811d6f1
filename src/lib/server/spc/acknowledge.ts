import { readAcknowledgeForm, type AcknowledgeRequest } from '$lib/spc';
import type { Actor } from '$lib/access';
import type { Db } from '../db';
import { acknowledgeSignal, AcknowledgeError, type SignalSummary } from './signals';

/** An acknowledgement done, or refused with the HTTP status, the field and the words. */
export type AcknowledgeOutcome =
	| { ok: true; signals: SignalSummary[] }
	| { ok: false; status: 403 | 404 | 409 | 422; field?: string; message: string };

/**
 * Acknowledge through `acknowledgeSignal`, with its refusals as a value (for the form actions; the
 * API route lets `errorResponse` answer them). `allowed`, when given, limits which signals this
 * caller may acknowledge (a technician: the open signals of the line in front of them): 403.
 */
export function tryAcknowledge(
	db: Db,
	id: number,
	input: AcknowledgeRequest,
	actor: Actor,
	allowed?: (signalId: number) => boolean
): AcknowledgeOutcome {
	if (allowed && !allowed(id))
		return {
			ok: false,
			status: 403,
			message: `Signal ${id} is not open on this line; acknowledge it from the signals page.`
		};
	try {
		return { ok: true, signals: acknowledgeSignal(db, id, input, actor) };
	} catch (err) {
		if (!(err instanceof AcknowledgeError)) throw err;
		return { ok: false, status: err.status, field: err.field, message: err.message };
	}
}

/** What the `acknowledge` form action answers: a success body, or a `fail(status, body)`. */
export type AcknowledgeFormOutcome =
	| { ok: true; body: { action: 'acknowledge'; id: number; ok: string } }
	| {
			ok: false;
			status: 403 | 404 | 409 | 422;
			body: { action: 'acknowledge'; id: number; field: string; error: string };
	  };

/**
 * The one `acknowledge` form action of the signals page and the line view: read the form (cause
 * and action chosen by the person, never defaulted; the wider scope only with the count shown),
 * acknowledge, and word the answer.
 * @example const out = acknowledgeFromForm(db, await request.formData(), actor); if (!out.ok) return fail(out.status, out.body);
 */
export function acknowledgeFromForm(
	db: Db,
	form: FormData,
	actor: Actor,
	allowed?: (signalId: number) => boolean
): AcknowledgeFormOutcome {
	const read = readAcknowledgeForm(form);
	if (!read.ok)
		return {
			ok: false,
			status: 422,
			body: { action: 'acknowledge', id: read.id, field: read.field, error: read.error }
		};
	const done = tryAcknowledge(db, read.id, read.input, actor, allowed);
	if (!done.ok)
		return {
			ok: false,
			status: done.status,
			body: {
				action: 'acknowledge',
				id: read.id,
				field: done.field ?? 'cause',
				error: done.message
			}
		};
	const n = done.signals.length;
	return {
		ok: true,
		body: {
			action: 'acknowledge',
			id: read.id,
			ok: `Acknowledged ${n} signal${n === 1 ? '' : 's'}.`
		}
	};
}
