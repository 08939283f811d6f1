/** The board side a signal's data was printed on, when known (from the stencil that printed it). */
export type BoardSide = 'top' | 'bottom';

/** An open signal as far as the wider acknowledgement scope is concerned. */
export interface ScopeMember {
	id: number;
	characteristicId: number;
	/** The run of the same rule the signal belongs to (null: it stands alone). */
	runId: number | null;
	side: BoardSide | null;
}

/**
 * The open signals a wider ("whole run") acknowledgement of `signal` closes: the same
 * characteristic, the same run and, when the signal's board side is known, the same side only:
 * a signal whose side is unknown or the other side stays open. Always includes the signal itself.
 * @example widerScopeIds(a, openSignals) // [a.id, …same chart, run and side]
 */
export function widerScopeIds(signal: ScopeMember, open: readonly ScopeMember[]): number[] {
	if (signal.runId === null) return [signal.id];
	const ids = open
		.filter(
			(s) =>
				s.id === signal.id ||
				(s.runId === signal.runId &&
					s.characteristicId === signal.characteristicId &&
					(signal.side === null || s.side === signal.side))
		)
		.map((s) => s.id);
	return ids.includes(signal.id) ? ids : [signal.id, ...ids];
}
