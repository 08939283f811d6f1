/**
 * The import row of one file (status 'importing') and the ids it reserves: spi_boards and spi_pads
 * ids are handed out in memory and reserved by raising `sqlite_sequence` in the chunk transaction
 * that uses them, so nothing else can take them even if the import never finishes; the board range
 * is recorded on the row for the clean-up (`import-rollback.ts`).
 */
import type Database from 'better-sqlite3';
import { CANONICAL_PROFILE } from '$lib/ingest';
import type { IngestRequest } from './ingest-types';

/** The open import row and its id reservation. */
export interface ImportRow {
	importId: number;
	/** The next spi_boards id of this import. */
	takeBoardId(): number;
	/** The next spi_pads id of this import (a new pad dictionary entry). */
	takePadId(): number;
	/** Reserve the ids taken so far; call inside the chunk transaction that writes their rows. */
	reserve(): void;
}

/** Write the 'importing' row of `request`; call inside a write transaction. */
export function openImportRow(
	conn: Database.Database,
	request: IngestRequest,
	startedAt: number
): ImportRow {
	// AUTOINCREMENT tables: the next id is past both the largest id and sqlite_sequence, so raising
	// sqlite_sequence reserves ids (nothing else can take them, even if this import never finishes).
	const nextIdOf = (table: string) =>
		Math.max(
			(conn.prepare(`select max(id) from ${table}`).pluck().get() as number | null) ?? 0,
			(conn.prepare(`select seq from sqlite_sequence where name = ?`).pluck().get(table) as
				number | undefined) ?? 0
		) + 1;
	const raiseSequence = (table: string, seq: number) => {
		const changed = conn
			.prepare(`update sqlite_sequence set seq = ? where name = ? and seq < ?`)
			.run(seq, table, seq).changes;
		if (changed === 0)
			conn
				.prepare(
					`insert into sqlite_sequence (name, seq) select ?, ? where not exists
					 (select 1 from sqlite_sequence where name = ?)`
				)
				.run(table, seq, table);
	};
	const firstBoardId = nextIdOf('spi_boards');
	let nextBoardId = firstBoardId;
	let reservedBoardId = firstBoardId - 1;
	let nextPadId = nextIdOf('spi_pads');
	let reservedPadId = nextPadId - 1;
	const importId = (
		conn
			.prepare(
				`insert into spi_imports (source, file_name, sha256, size_bytes, status, profile_id,
				 profile_name, created_by, user_id, source_path, started_at, finished_at,
				 board_id_from, board_id_to)
				 values (?, ?, '', 0, 'importing', ?, ?, ?, ?, ?, ?, ?, ?, ?) returning id`
			)
			.get(
				request.source,
				request.fileName,
				request.profileId ?? null,
				(request.profile ?? CANONICAL_PROFILE).name,
				request.createdBy,
				request.userId ?? null,
				request.sourcePath ?? null,
				startedAt,
				startedAt,
				firstBoardId,
				firstBoardId - 1
			) as { id: number }
	).id;
	const recordReservedBoards = conn.prepare(`update spi_imports set board_id_to = ? where id = ?`);

	return {
		importId,
		takeBoardId: () => nextBoardId++,
		takePadId: () => nextPadId++,
		reserve(): void {
			if (nextBoardId - 1 > reservedBoardId) {
				reservedBoardId = nextBoardId - 1;
				raiseSequence('spi_boards', reservedBoardId);
				recordReservedBoards.run(reservedBoardId, importId);
			}
			if (nextPadId - 1 > reservedPadId) {
				reservedPadId = nextPadId - 1;
				raiseSequence('spi_pads', reservedPadId);
			}
		}
	};
}
