import { fail } from '@sveltejs/kit';
import type { PendingConfirmation } from '$lib/confirmation';

/**
 * Destructive form actions run only with `confirm=yes` (the ConfirmDialog's button). Without it
 * the action answers 400 with the question, which ConfirmStep shows when JavaScript is off.
 * Returns null when confirmed.
 */
export function askConfirmation(
	data: FormData,
	action: string,
	prompt: Omit<PendingConfirmation, 'action' | 'fields'>
) {
	if (data.get('confirm') === 'yes') return null;
	const fields: Record<string, string> = {};
	for (const [name, value] of data) {
		if (name !== 'confirm' && typeof value === 'string') fields[name] = value;
	}
	return fail(400, { confirm: { action, fields, ...prompt } satisfies PendingConfirmation });
}
