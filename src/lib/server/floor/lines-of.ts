import type { Db } from '../db';
import type { PublishedFloorEvent } from './events';

/** Lines an event touches (queries on indexes; runs after the service's commit). */
export function linesOfEvent(db: Db, e: PublishedFloorEvent): number[] {
	const c = db.$client;
	switch (e.kind) {
		case 'spi-import':
			return c
				.prepare(
					`select distinct line_id from spi_boards where import_id = ? and line_id is not null`
				)
				.pluck()
				.all(e.importId) as number[];
		case 'run':
			return c
				.prepare(`select line_id from print_runs where id = ?`)
				.pluck()
				.all(e.runId) as number[];
		case 'paste-lot':
			return c
				.prepare(`select line_id from print_runs where paste_lot_id = ? and ended_at is null`)
				.pluck()
				.all(e.lotId) as number[];
		case 'stencil':
			return c
				.prepare(`select line_id from print_runs where stencil_id = ? and ended_at is null`)
				.pluck()
				.all(e.stencilId) as number[];
		case 'signal':
			return signalLines(db, e.signalIds);
		case 'machine':
			return [...e.lineIds];
	}
}

function signalLines(db: Db, ids: readonly number[]): number[] {
	const out = new Set<number>();
	const sig = db.$client.prepare(
		`select point_key as pointKey, board_ids as boardIds from spc_signals where id = ?`
	);
	const runLine = db.$client.prepare(`select line_id from print_runs where id = ?`).pluck();
	const boardLine = db.$client.prepare(`select line_id from spi_boards where id = ?`).pluck();
	const cfxUnitLine = db.$client.prepare(`select line_id from cfx_units where id = ?`).pluck();
	for (const id of ids.slice(0, 500)) {
		const row = sig.get(id) as { pointKey: string; boardIds: string } | undefined;
		if (!row) continue;
		const run = /^run:(\d+)$/.exec(row.pointKey);
		let line: number | null | undefined;
		const cfxUnit = /^cfx-unit:(\d+)$/.exec(row.pointKey);
		if (run) line = runLine.get(Number(run[1])) as number | undefined;
		else if (cfxUnit) line = cfxUnitLine.get(Number(cfxUnit[1])) as number | undefined;
		else {
			try {
				const boards = JSON.parse(row.boardIds) as number[];
				if (boards.length)
					line = boardLine.get(boards[boards.length - 1]) as number | null | undefined;
			} catch {
				line = null;
			}
		}
		if (typeof line === 'number') out.add(line);
	}
	return [...out];
}
