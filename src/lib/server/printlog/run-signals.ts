import { eq } from 'drizzle-orm';
import type { Db } from '../db';
import { printRuns } from '../db/schema';
import { evaluateSignalsAfterPrintRun } from '../spc/signals';

/**
 * Judge the control charts of a run's line and product after the run was logged, ended or
 * corrected, so print-parameter charts signal (and mail their followers) as runs come in.
 * Never throws: a charting problem must not undo a saved run.
 */
export async function evaluateChartsForRun(db: Db, runId: number): Promise<void> {
	const run = db
		.select({ lineId: printRuns.lineId, productId: printRuns.productId })
		.from(printRuns)
		.where(eq(printRuns.id, runId))
		.get();
	if (run) await evaluateSignalsAfterPrintRun(db, run);
}

/**
 * Raise a run's signals once its change has committed; the print-run service calls this, routes
 * never do. The charts of one line and product are judged (a few indexed reads over the last
 * points) and new signals stored before this returns, so an answer sent next already shows them;
 * only the mail to followers goes on after the request, off its path.
 */
export function raiseRunSignals(db: Db, runId: number): void {
	evaluateChartsForRun(db, runId).catch((err) => {
		console.error('[printlog] signal evaluation after a print run failed', err);
	});
}
