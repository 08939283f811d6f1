/** A destructive action waiting for "yes" (client-safe; see $lib/server/confirm). */
export type PendingConfirmation = {
	/** The form action to post again, e.g. "?/revokeToken". */
	action: string;
	/** The form's own fields, posted again unchanged. */
	fields: Record<string, string>;
	title: string;
	message: string;
	confirmLabel: string;
};
