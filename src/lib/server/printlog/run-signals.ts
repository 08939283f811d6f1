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
