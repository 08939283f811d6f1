/**
 * Stage "commit": ONE short transaction makes a good file visible: the pad dictionary entries,
 * the board rows with their aggregates, the aperture links and the status 'imported'. The
 * duplicate check is repeated inside it (another import of the same bytes may have landed).
 */
import type Database from 'better-sqlite3';
import type { BatchWriter, StoredImport } from './batch-writer';
import type { ArchiveWriter } from './archive';
import { beginWrite } from './import-connection';
import type { ReceivedFile } from './stage-receive';

/** What the commit stage decided. */
export interface CommitOutcome {
	/** Set when the import was made visible. */
	stored: StoredImport | null;
	/** The earlier import of the same bytes, when this file is a duplicate. */
	duplicateOf: number | null;
}

/**
 * Commit the import when the file is good and new; otherwise leave everything to the verdict
 * stage (nothing is written).
 * @throws Error when the import row was cleaned up meanwhile (a second server on this database).
 */
export async function commitImport(
	conn: Database.Database,
	writer: BatchWriter,
	file: ReceivedFile,
	archive: ArchiveWriter
): Promise<CommitOutcome> {
	const earlierImport = () =>
		(conn
			.prepare(`select id from spi_imports where sha256 = ? and status = 'imported'`)
			.pluck()
			.get(file.sha256) as number | undefined) ?? null;
	let duplicateOf = earlierImport();
	if (duplicateOf !== null || !file.summary.ok || file.writeFailure) {
		return { stored: null, duplicateOf };
	}
	let stored: StoredImport | null = null;
	await beginWrite(conn);
	try {
		const state = conn
			.prepare(`select status from spi_imports where id = ?`)
			.pluck()
			.get(writer.importId);
		// Cleaned up meanwhile (a second server started on this database): never half-commit.
		if (state !== 'importing') throw new Error('the import was cleaned up while it ran');
		duplicateOf = earlierImport();
		if (duplicateOf === null) {
			stored = writer.finish(file.summary);
			const archivePath = archive.commit(file.sha256);
			const { summary } = file;
			conn
				.prepare(
					`update spi_imports set status = 'imported', sha256 = ?, size_bytes = ?, finished_at = ?,
					 data_rows = ?, boards = ?, pads = ?, rejected_rows = ?, duplicate_boards = ?,
					 error_count = ?, errors = ?, warnings = ?, archive_path = ?,
					 board_id_from = null, board_id_to = null where id = ?`
				)
				.run(
					file.sha256,
					file.sizeBytes,
					Date.now(),
					summary.dataRows,
					stored.boards,
					stored.pads,
					summary.rowsRejected,
					stored.duplicateBoards,
					summary.errorCount,
					JSON.stringify(summary.errors),
					JSON.stringify(summary.warnings),
					archivePath,
					writer.importId
				);
		}
		conn.exec(duplicateOf === null ? 'COMMIT' : 'ROLLBACK');
	} catch (err) {
		if (conn.inTransaction) conn.exec('ROLLBACK');
		throw err;
	}
	return { stored, duplicateOf };
}
