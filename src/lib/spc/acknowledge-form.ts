/** What an acknowledgement asks for, from a form or an API body. */
export interface AcknowledgeRequest {
	cause: string;
	action: string;
	note?: string;
	/** Also acknowledge the other open signals of the same run (same chart and side). */
	wholeRun?: boolean;
	/** How many signals the person saw it would close; a different number is refused (409). */
	expectedCount?: number;
}

/** The acknowledge form read: the signal and the request, or the field the person must fill. */
export type AcknowledgeFormRead =
	| { ok: true; id: number; input: AcknowledgeRequest }
	| { ok: false; id: number; field: 'id' | 'cause' | 'action'; error: string };

/**
 * Read an acknowledge form (fields `id`, `cause`, `action`, `note`, and `scope=pattern` with the
 * `count` the person was shown). Nothing is chosen for the person: an empty cause or action is
 * named, never defaulted.
 * @example readAcknowledgeForm(formData).ok
 */
export function readAcknowledgeForm(form: FormData): AcknowledgeFormRead {
	const text = (name: string) => String(form.get(name) ?? '');
	const id = Number(form.get('id'));
	if (!Number.isSafeInteger(id) || id <= 0)
		return { ok: false, id: 0, field: 'id', error: 'Choose a signal to acknowledge.' };
	const wholeRun = form.get('scope') === 'pattern';
	const count = Number(form.get('count'));
	const input: AcknowledgeRequest = {
		cause: text('cause').trim(),
		action: text('action').trim(),
		note: text('note'),
		wholeRun,
		expectedCount: wholeRun && Number.isInteger(count) && count > 0 ? count : undefined
	};
	if (!input.cause) return { ok: false, id, field: 'cause', error: 'Choose the assignable cause.' };
	if (!input.action)
		return { ok: false, id, field: 'action', error: 'Choose the corrective action taken.' };
	return { ok: true, id, input };
}
