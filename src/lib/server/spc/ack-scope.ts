import { and, eq, inArray, isNull } from 'drizzle-orm';
import { runSide } from '$lib/floor/tile';
import { widerScopeIds, type BoardSide, type ScopeMember } from '$lib/spc';
import type { Db } from '../db';
import { printRuns, productStencilApprovals, spcSignals, spiBoards, stencils } from '../db/schema';

type Reader = Pick<Db, 'select'>;

const CHUNK = 500;

/**
 * The board side of each signal's completing point, as the line tile names the side printed
 * (`runSide`): the one side the stencil that printed it is approved for on the product, else the
 * side its name says. A print-run point ("run:12") by the run's stencil, an SPI point
 * ("board:88") by the board's stencil, else the stencil of the run the board came from. Null when
 * not recorded.
 */
export function signalSides(db: Reader, signals: { id: number; pointKey: string }[]) {
	const runIds = new Set<number>();
	const boardIds = new Set<number>();
	for (const s of signals) {
		const m = /^(run|board):(\d+)$/.exec(s.pointKey);
		if (m) (m[1] === 'run' ? runIds : boardIds).add(Number(m[2]));
	}
	/** Product and stencil name of each point, before the approvals are read. */
	const printedWith = new Map<string, { productId: number | null; stencil: string | null }>();
	const runs = [...runIds];
	for (let i = 0; i < runs.length; i += CHUNK) {
		for (const r of db
			.select({ id: printRuns.id, productId: printRuns.productId, name: stencils.name })
			.from(printRuns)
			.leftJoin(stencils, eq(stencils.id, printRuns.stencilId))
			.where(inArray(printRuns.id, runs.slice(i, i + CHUNK)))
			.all())
			printedWith.set(`run:${r.id}`, { productId: r.productId, stencil: r.name });
	}
	const boards = [...boardIds];
	for (let i = 0; i < boards.length; i += CHUNK) {
		for (const b of db
			.select({
				id: spiBoards.id,
				productId: spiBoards.productId,
				stencil: stencils.name,
				stencilName: spiBoards.stencilName,
				runStencilId: printRuns.stencilId
			})
			.from(spiBoards)
			.leftJoin(stencils, eq(stencils.id, spiBoards.stencilId))
			.leftJoin(printRuns, eq(printRuns.id, spiBoards.printRunId))
			.where(inArray(spiBoards.id, boards.slice(i, i + CHUNK)))
			.all()) {
			let stencil = b.stencil ?? b.stencilName;
			if (stencil === null && b.runStencilId !== null)
				stencil =
					db
						.select({ name: stencils.name })
						.from(stencils)
						.where(eq(stencils.id, b.runStencilId))
						.get()?.name ?? null;
			printedWith.set(`board:${b.id}`, { productId: b.productId, stencil });
		}
	}
	const approved = new Map<string, BoardSide[]>();
	const sideOf = (p: { productId: number | null; stencil: string | null }): BoardSide | null => {
		if (p.stencil === null) return null;
		const key = `${p.productId}|${p.stencil}`;
		let sides = approved.get(key);
		if (!sides) {
			sides =
				p.productId === null
					? []
					: db
							.select({ side: productStencilApprovals.side })
							.from(productStencilApprovals)
							.where(
								and(
									eq(productStencilApprovals.productId, p.productId),
									eq(productStencilApprovals.stencilName, p.stencil)
								)
							)
							.all()
							.map((r) => r.side)
							.filter((side): side is BoardSide => side === 'top' || side === 'bottom')
							// One row per side (the approval is unique by product, stencil and side).
							.filter((side, i, all) => all.indexOf(side) === i);
			approved.set(key, sides);
		}
		return runSide({ name: p.stencil, approvedSides: sides });
	};
	const out = new Map<number, BoardSide | null>();
	for (const s of signals) {
		const p = printedWith.get(s.pointKey);
		out.set(s.id, p ? sideOf(p) : null);
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
