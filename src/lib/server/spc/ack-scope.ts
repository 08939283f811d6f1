import { and, eq, inArray, isNull, sql } from 'drizzle-orm';
import type { Db } from '../db';
import { spcSignals } from '../db/schema';

/**
 * How many open signals a "whole pattern" acknowledgement of each given signal would close: the
 * open signals of the same chart (characteristic) in the same run of the same rule. A chart is one
 * product, measure and set of lines, so this never reaches another chart's signals.
 * @returns signal id → count (1 when the signal stands alone).
 */
export function patternScopeCounts(db: Db, signalIds: number[]): Map<number, number> {
	const out = new Map<number, number>();
	if (signalIds.length === 0) return out;
	const rows = db
		.select({
			id: spcSignals.id,
			runId: spcSignals.runId,
			characteristicId: spcSignals.characteristicId
		})
		.from(spcSignals)
		.where(inArray(spcSignals.id, signalIds.slice(0, 1000)))
		.all();
	const runIds = [...new Set(rows.map((r) => r.runId).filter((r): r is number => r !== null))];
	const counts = new Map<string, number>();
	if (runIds.length) {
		for (const c of db
			.select({
				runId: spcSignals.runId,
				characteristicId: spcSignals.characteristicId,
				n: sql<number>`count(*)`
			})
			.from(spcSignals)
			.where(and(inArray(spcSignals.runId, runIds), isNull(spcSignals.ackAt)))
			.groupBy(spcSignals.runId, spcSignals.characteristicId)
			.all()) {
			counts.set(`${c.runId}:${c.characteristicId}`, c.n);
		}
	}
	for (const r of rows)
		out.set(
			r.id,
			r.runId === null ? 1 : Math.max(1, counts.get(`${r.runId}:${r.characteristicId}`) ?? 1)
		);
	return out;
}

/** The open signals a pattern acknowledgement of `signal` closes (the same chart and run). */
export function patternTargets(
	db: Pick<Db, 'select'>,
	signal: { id: number; runId: number | null; characteristicId: number }
): number[] {
	if (signal.runId === null) return [signal.id];
	return db
		.select({ id: spcSignals.id })
		.from(spcSignals)
		.where(
			and(
				eq(spcSignals.runId, signal.runId),
				eq(spcSignals.characteristicId, signal.characteristicId),
				isNull(spcSignals.ackAt)
			)
		)
		.all()
		.map((r) => r.id);
}
