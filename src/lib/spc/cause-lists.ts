/** The site-editable lists an acknowledgement chooses from. */
export interface CauseLists {
	causes: string[];
	actions: string[];
}

/** Starting lists (common practice at the printer; the site edits them). */
export const DEFAULT_CAUSE_LISTS: CauseLists = {
	causes: [
		'Stencil underside dirty',
		'Paste roll too small',
		'Paste dried or past its open time',
		'Squeegee pressure drift',
		'Board support or clamping',
		'Stencil damaged or worn',
		'Aperture clogged',
		'New paste lot',
		'Measurement or SPI setup',
		'No cause found'
	],
	actions: [
		'Wipe stencil',
		'Replenish paste',
		'Adjust pressure',
		'Adjust speed',
		'Replace stencil',
		'Clean apertures',
		'Fix board support',
		'Recalibrate SPI',
		'Watch, no change'
	]
};

/** Clean one list: trimmed, non-empty, unique, at most 60 entries of 80 characters. */
export function cleanList(entries: readonly string[]): string[] {
	return [...new Set(entries.map((e) => e.trim().slice(0, 80)).filter(Boolean))].slice(0, 60);
}

/** Why a chosen cause or action is refused, naming the field; null when both are listed. */
export function causeChoiceError(
	lists: CauseLists,
	cause: string,
	action: string
): { field: 'cause' | 'action'; message: string } | null {
	if (!lists.causes.includes(cause)) {
		return {
			field: 'cause',
			message: `"${cause}" is not in the list of assignable causes (${lists.causes.join(', ')}).`
		};
	}
	if (!lists.actions.includes(action)) {
		return {
			field: 'action',
			message: `"${action}" is not in the list of corrective actions (${lists.actions.join(', ')}).`
		};
	}
	return null;
}
