/**
 * Taking an unfinished import back out: its pad rows were committed in chunks against board ids
 * it reserved, and nothing reaches them until the final transaction writes the board rows. A
 * rejected, duplicate or failed file and an import a stopped server left behind are removed here.
 */
import type Database from 'better-sqlite3';
import type { Db } from '../db';
import { inWriteTransaction } from './import-connection';

/** Board ids per delete transaction when a failed or interrupted import's rows are removed. */
const DISCARD_BOARDS_PER_STEP = 8;

/**
 * Delete the pad rows of an unfinished import (status 'importing'), a few boards per short
 * transaction with the event loop given back in between, and clear its reserved range. Board ids
 * that have a spi_boards row are never touched (they belong to a finished import).
 */
export async function discardImportRows(conn: Database.Database, importId: number): Promise<void> {
	const range = conn
		.prepare(
			`select board_id_from as "from", board_id_to as "to" from spi_imports
			 where id = ? and status = 'importing'`
		)
		.get(importId) as { from: number | null; to: number | null } | undefined;
	if (!range || range.from === null || range.to === null || range.to < range.from) return;
	const deleteRows = conn.prepare(
		`delete from spi_pad_measurements where board_id between ? and ?
		 and board_id not in (select id from spi_boards where id between ? and ?)`
	);
	const shrink = conn.prepare(`update spi_imports set board_id_from = ? where id = ?`);
	for (let from = range.from; from <= range.to; from += DISCARD_BOARDS_PER_STEP) {
		const to = Math.min(range.to, from + DISCARD_BOARDS_PER_STEP - 1);
		await inWriteTransaction(conn, () => {
			deleteRows.run(from, to, from, to);
			// Progress is recorded with the deletes, so a crash part-way resumes where it stopped.
			shrink.run(to + 1, importId);
		});
		await new Promise((r) => setImmediate(r));
	}
}

/**
 * Remove what imports cut short by a stopped server left (status 'importing'): their pad rows
 * (in chunks) and their rows, which become 'rejected' with a message saying so (the file is
 * imported whole when sent again; a watched file still in its folder is picked up again).
 * Run at start-up, before any import starts. Returns how many imports were cleaned up.
 */
export async function recoverInterruptedImports(db: Db): Promise<number> {
	const conn = db.$client;
	const ids = conn
		.prepare(`select id from spi_imports where status = 'importing' order by id`)
		.pluck()
		.all() as number[];
	for (const id of ids) {
		await discardImportRows(conn, id);
		conn
			.prepare(
				`update spi_imports set status = 'rejected', finished_at = ?, error_count = 1, errors = ?,
				 board_id_from = null, board_id_to = null where id = ?`
			)
			.run(
				Date.now(),
				JSON.stringify([
					{
						row: 0,
						column: null,
						message:
							'The server stopped during this import; nothing of it was kept. Import the file again.'
					}
				]),
				id
			);
	}
	return ids.length;
}
