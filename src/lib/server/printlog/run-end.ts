import { eq } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import { validateRunTimes } from '$lib/printlog';
import { recordAudit } from '../audit';
import type { Db } from '../db';
import { printRuns } from '../db/schema';
import { publishFloorEvent } from '../floor/events';
import { PrintlogRequestError } from './request-error';
import { requireRun } from './run-queries';
import { raiseRunSignals } from './run-signals';
import type { RunView } from './run-view';

/**
 * End an open run at `endedAt` (default now) with the boards printed; its signals are raised.
 * @throws PrintlogRequestError 404 unknown run; 409 already ended; 422 end before start.
 */
export function endRun(
	db: Db,
	id: number,
	input: { endedAt?: string; boardsPrinted?: number },
	actor: Actor,
	nowMs = Date.now()
): RunView {
	const ended = db.transaction((tx) => {
		const run = requireRun(tx as unknown as Db, id);
		if (run.endedAt) {
			throw new PrintlogRequestError(409, [
				{ field: 'endedAt', message: `run ${id} already ended at ${run.endedAt.toISOString()}` }
			]);
		}
		const endedAtMs = input.endedAt ? Date.parse(input.endedAt) : nowMs;
		const errors = validateRunTimes({ startedAt: run.startedAt, endedAt: endedAtMs });
		if (errors.length) throw new PrintlogRequestError(422, errors);
		tx.update(printRuns)
			.set({
				endedAt: new Date(endedAtMs),
				...(input.boardsPrinted !== undefined && { boardsPrinted: input.boardsPrinted })
			})
			.where(eq(printRuns.id, id))
			.run();
		const after = requireRun(tx as unknown as Db, id);
		recordAudit(tx, actor, {
			action: 'end',
			entity: 'print_run',
			entityId: id,
			before: { endedAt: null, boardsPrinted: run.boardsPrinted },
			after: { endedAt: after.endedAt!.toISOString(), boardsPrinted: after.boardsPrinted }
		});
		// Listeners run after this synchronous transaction has committed.
		publishFloorEvent({ kind: 'run', what: 'ended', runId: id });
		return after;
	});
	raiseRunSignals(db, id);
	return ended;
}
