import { and, eq, inArray, isNull } from 'drizzle-orm';
import { stencilSide } from '$lib/floor/tile';
import { widerScopeIds, type BoardSide, type ScopeMember } from '$lib/spc';
import type { Db } from '../db';
import { printRuns, spcSignals, spiBoards, stencils } from '../db/schema';

type Reader = Pick<Db, 'select'>;

const CHUNK = 500;

/**
 * The board side of each signal's completing point, from the stencil that printed it (its name,
 * `stencilSide`): a print-run point ("run:12") by the run's stencil, an SPI point ("board:88") by
 * the board's stencil, else the stencil of the run the board came from. Null when not recorded.
 */
export function signalSides(db: Reader, signals: { id: number; pointKey: string }[]) {
	const runIds = new Set<number>();
	const boardIds = new Set<number>();
	for (const s of signals) {
		const m = /^(run|board):(\d+)$/.exec(s.pointKey);
		if (m) (m[1] === 'run' ? runIds : boardIds).add(Number(m[2]));
	}
	const runSide = new Map<number, BoardSide | null>();
	const runs = [...runIds];
	for (let i = 0; i < runs.length; i += CHUNK) {
		for (const r of db
			.select({ id: printRuns.id, name: stencils.name })
			.from(printRuns)
			.leftJoin(stencils, eq(stencils.id, printRuns.stencilId))
			.where(inArray(printRuns.id, runs.slice(i, i + CHUNK)))
			.all())
			runSide.set(r.id, stencilSide(r.name));
	}
	const boardSide = new Map<number, BoardSide | null>();
	const boards = [...boardIds];
	for (let i = 0; i < boards.length; i += CHUNK) {
		for (const b of db
			.select({
				id: spiBoards.id,
				stencil: stencils.name,
				stencilName: spiBoards.stencilName,
				runStencilId: printRuns.stencilId
			})
			.from(spiBoards)
			.leftJoin(stencils, eq(stencils.id, spiBoards.stencilId))
			.leftJoin(printRuns, eq(printRuns.id, spiBoards.printRunId))
			.where(inArray(spiBoards.id, boards.slice(i, i + CHUNK)))
			.all()) {
			let side = stencilSide(b.stencil) ?? stencilSide(b.stencilName);
			if (side === null && b.runStencilId !== null) {
				const run = db
					.select({ name: stencils.name })
					.from(stencils)
					.where(eq(stencils.id, b.runStencilId))
					.get();
				side = stencilSide(run?.name);
			}
			boardSide.set(b.id, side);
		}
	}
	const out = new Map<number, BoardSide | null>();
	for (const s of signals) {
		const m = /^(run|board):(\d+)$/.exec(s.pointKey);
		const side = m ? (m[1] === 'run' ? runSide : boardSide).get(Number(m[2])) : null;
		out.set(s.id, side ?? null);
	}
	return out;
}

/** The open signals of these runs as scope members (with their sides). */
function openRunMembers(db: Reader, runIds: number[]): ScopeMember[] {
	const rows: { id: number; characteristicId: number; runId: number | null; pointKey: string }[] =
		[];
	for (let i = 0; i < runIds.length; i += CHUNK) {
		rows.push(
			...db
				.select({
					id: spcSignals.id,
					characteristicId: spcSignals.characteristicId,
					runId: spcSignals.runId,
					pointKey: spcSignals.pointKey
				})
				.from(spcSignals)
				.where(and(inArray(spcSignals.runId, runIds.slice(i, i + CHUNK)), isNull(spcSignals.ackAt)))
				.all()
		);
	}
	const sides = signalSides(db, rows);
	return rows.map((r) => ({
		id: r.id,
		characteristicId: r.characteristicId,
		runId: r.runId,
		side: sides.get(r.id) ?? null
	}));
}

/**
 * How many open signals a "whole run" acknowledgement of each given signal would close: the open
 * signals of the same chart (characteristic) in the same run of the same rule, on the same board
 * side when the side is known (`widerScopeIds`).
 * @returns signal id → count (1 when the signal stands alone).
 */
export function patternScopeCounts(db: Db, signalIds: number[]): Map<number, number> {
	const out = new Map<number, number>();
	if (signalIds.length === 0) return out;
	const rows = db
		.select({
			id: spcSignals.id,
			runId: spcSignals.runId,
			characteristicId: spcSignals.characteristicId,
			pointKey: spcSignals.pointKey
		})
		.from(spcSignals)
		.where(inArray(spcSignals.id, signalIds.slice(0, 1000)))
		.all();
	const runIds = [...new Set(rows.map((r) => r.runId).filter((r): r is number => r !== null))];
	const open = runIds.length ? openRunMembers(db, runIds) : [];
	const sides = signalSides(db, rows);
	for (const r of rows)
		out.set(r.id, widerScopeIds({ ...r, side: sides.get(r.id) ?? null }, open).length);
	return out;
}

/** The open signals a "whole run" acknowledgement of `signal` closes (same chart, run and side). */
export function patternTargets(
	db: Reader,
	signal: { id: number; runId: number | null; characteristicId: number; pointKey: string }
): number[] {
	if (signal.runId === null) return [signal.id];
	const open = openRunMembers(db, [signal.runId]);
	const side =
		open.find((s) => s.id === signal.id)?.side ?? signalSides(db, [signal]).get(signal.id);
	return widerScopeIds({ ...signal, side: side ?? null }, open);
}
