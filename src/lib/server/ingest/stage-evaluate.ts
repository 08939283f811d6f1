/**
 * Stage "evaluate": a committed import is announced to the line overview, and the charts judge
 * its new boards at once (signals, mail).
 */
import type { Db } from '../db';
import { publishFloorEvent } from '../floor/events';

/** Announce the import and evaluate the charts over its boards (logs its own failures). */
export async function evaluateImport(db: Db, importId: number, boardIds: number[]): Promise<void> {
	publishFloorEvent({ kind: 'spi-import', importId, boardIds });
	if (boardIds.length === 0) return;
	// Charts judge the new boards at once (it logs its own failures, never throws).
	const { evaluateSignalsAfterIngest } = await import('../spc/signals');
	await evaluateSignalsAfterIngest(db, boardIds);
}
