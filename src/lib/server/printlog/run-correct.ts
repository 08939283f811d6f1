import { eq } from 'drizzle-orm';
import type { Actor } from '$lib/access';
import {
	assessLotForRun,
	checkRunAgainstRecipe,
	deviationReasonErrors,
	findOverlappingOpenRun,
	normaliseScannedCode,
	parseBoardSerial,
	runChanges,
	validateRunTimes,
	type FieldError,
	type RecipeParameters
} from '$lib/printlog';
import { recordAudit } from '../audit';
import type { Db } from '../db';
import { printRuns } from '../db/schema';
import { publishFloorEvent } from '../floor/events';
import { listStencilRefs, stencilByName } from './lookups';
import { asPasteEvents, getPasteLot, listPasteLots } from './paste-lots';
import { recipeById } from './recipes';
import { PrintlogRequestError } from './request-error';
import { openRuns, requireRun } from './run-queries';
import { raiseRunSignals } from './run-signals';
import { auditSnapshot, type RunView, type StoredDeviation } from './run-view';
import { unknownCode } from './scanned-codes';

/** What a correction may change; `reason` is required and kept in the audit log. */
export type RunCorrection = {
	reason: string;
	/** Stencil name and lot number as scanned (codes, like a new run). */
	stencil?: string;
	pasteLot?: string;
	boardSerial?: string | null;
	parameters?: Record<string, unknown>;
	ambientTempC?: number | null;
	relativeHumidityPct?: number | null;
	boardsPrinted?: number;
	startedAt?: string;
	endedAt?: string | null;
	bladeCode?: string | null;
	deviationReasons?: Record<string, string | undefined>;
};

/**
 * Correct a logged run. Every recorded field may change: stencil and paste lot (by the code a
 * scanner reads; unknown codes refused with suggestions, a newly named lot refused when it was
 * expired or discarded at the run's start), blade, board serial, start and end, board count,
 * ambient values and every setting. The new values are checked again against the recipe version
 * the run recorded (deviations need reasons as at start), times must stay in order and the line
 * must not get two open runs. The audit log keeps the before and after with the reason; the
 * run's correction counter goes up, so a corrected run is never silently different. A
 * correction that changes nothing is refused. The run's signals are raised again.
 * @throws PrintlogRequestError 404 / 422 / 409.
 */
export function correctRun(db: Db, id: number, input: RunCorrection, actor: Actor): RunView {
	const corrected = db.transaction((tx) => {
		const t = tx as unknown as Db;
		const run = requireRun(t, id);
		const errors: FieldError[] = [];
		if (!input.reason?.trim()) {
			errors.push({ field: 'reason', message: 'say why the run is corrected' });
		}
		const parameters = { ...run.parameters, ...(input.parameters ?? {}) };
		const ambientTempC = input.ambientTempC !== undefined ? input.ambientTempC : run.ambientTempC;
		const relativeHumidityPct =
			input.relativeHumidityPct !== undefined ? input.relativeHumidityPct : run.relativeHumidityPct;
		const startedAt = input.startedAt ?? run.startedAt.toISOString();
		const endedAt =
			input.endedAt !== undefined ? input.endedAt : (run.endedAt?.toISOString() ?? null);
		errors.push(...validateRunTimes({ startedAt, endedAt }));

		let stencilId = run.stencilId;
		const stencilName = input.stencil?.trim();
		if (
			stencilName &&
			normaliseScannedCode(stencilName) !== normaliseScannedCode(run.stencil ?? '')
		) {
			const ref = stencilByName(t, stencilName);
			if (ref) stencilId = ref.id;
			else {
				const names = [...new Set(listStencilRefs(t).map((s) => s.name))];
				errors.push({ field: 'stencil', message: unknownCode('stencil', stencilName, names) });
			}
		}
		let pasteLotId = run.pasteLotId;
		const lotNumber = input.pasteLot?.trim();
		if (lotNumber && normaliseScannedCode(lotNumber) !== normaliseScannedCode(run.pasteLot ?? '')) {
			const startMs = Date.parse(startedAt);
			const lot = getPasteLot(t, lotNumber);
			if (!lot || normaliseScannedCode(lot.lotNumber) !== normaliseScannedCode(lotNumber)) {
				const numbers = listPasteLots(t).map((l) => l.lotNumber);
				errors.push({ field: 'pasteLot', message: unknownCode('paste lot', lotNumber, numbers) });
			} else {
				pasteLotId = lot.id;
				if (Number.isFinite(startMs)) {
					const events = asPasteEvents(lot.events);
					const refused = assessLotForRun(lot, events, lot.handling, startMs).refuse;
					for (const r of refused) {
						errors.push({ field: 'pasteLot', message: `${r.message} (at the run's start)` });
					}
				}
			}
		}
		let boardSerial = run.boardSerial;
		if (input.boardSerial !== undefined) {
			const parsed = parseBoardSerial(input.boardSerial);
			if (parsed.error) errors.push(parsed.error);
			boardSerial = parsed.value;
		}

		const recipe = run.recipeId ? recipeById(t, run.recipeId) : undefined;
		const check = checkRunAgainstRecipe(
			{
				...parameters,
				...(ambientTempC !== null && { ambientTempC }),
				...(relativeHumidityPct !== null && { relativeHumidityPct })
			},
			{
				line: run.line,
				product: run.product,
				parameters: (recipe?.parameters ?? {}) as RecipeParameters
			}
		);
		errors.push(...check.errors);
		const reasons: Record<string, string | undefined> = {
			...Object.fromEntries(
				run.deviations.filter((d) => d.reason).map((d) => [d.parameter, d.reason!])
			),
			...(input.deviationReasons ?? {})
		};
		errors.push(...deviationReasonErrors(check.deviations, reasons));
		if (errors.length) throw new PrintlogRequestError(422, errors);
		if (endedAt === null && run.endedAt !== null) {
			const clash = findOverlappingOpenRun(openRuns(t), run.line, id);
			if (clash) {
				throw new PrintlogRequestError(409, [{ field: 'endedAt', message: clash.message }]);
			}
		}
		const stored: StoredDeviation[] = check.deviations.map((d) => ({
			...d,
			reason: reasons[d.parameter]?.trim() || null
		}));
		tx.update(printRuns)
			.set({
				stencilId,
				pasteLotId,
				boardSerial,
				parameters,
				ambientTempC,
				relativeHumidityPct,
				startedAt: new Date(Date.parse(startedAt)),
				endedAt: endedAt === null ? null : new Date(Date.parse(endedAt)),
				boardsPrinted: input.boardsPrinted ?? run.boardsPrinted,
				bladeCode: input.bladeCode !== undefined ? input.bladeCode?.trim() || null : run.bladeCode,
				deviations: stored,
				deviationReasons: Object.fromEntries(
					stored.filter((d) => d.reason).map((d) => [d.parameter, d.reason!])
				),
				corrections: run.corrections + 1
			})
			.where(eq(printRuns.id, id))
			.run();
		const after = requireRun(t, id);
		const before = auditSnapshot(run);
		const afterSnapshot = auditSnapshot(after);
		const reasonsChanged =
			JSON.stringify(run.deviations.map((d) => d.reason)) !==
			JSON.stringify(after.deviations.map((d) => d.reason));
		if (runChanges(before, afterSnapshot).length === 0 && !reasonsChanged) {
			// Throwing rolls the update back: a correction must change something.
			throw new PrintlogRequestError(422, [
				{ field: '(body)', message: 'nothing differs from the recorded run: nothing to correct' }
			]);
		}
		recordAudit(tx, actor, {
			action: 'correct',
			entity: 'print_run',
			entityId: id,
			before,
			after: { ...afterSnapshot, correctionReason: input.reason.trim() }
		});
		// Listeners run after this synchronous transaction has committed.
		publishFloorEvent({ kind: 'run', what: 'corrected', runId: id });
		return after;
	});
	raiseRunSignals(db, id);
	return corrected;
}
