/**
 * Stage "verdict" for a file that is not imported: a duplicate of an earlier import, or rejected
 * (a bad row under the default policy, a file-level error, a pad written twice). Nothing of its
 * data stays: its chunk rows go first, then its import row records the verdict and the errors.
 */
import type Database from 'better-sqlite3';
import type { IngestIssue, SpiParseSummary } from '$lib/ingest';
import type { ArchiveWriter } from './archive';
import type { BatchWriter } from './batch-writer';
import { discardImportRows } from './import-rollback';
import type { IngestOutcome, IngestRequest } from './ingest-types';
import type { ReceivedFile } from './stage-receive';
import { reportDone } from './stage-report';

/** Errors kept on a rejected import row and in the answer. */
const KEPT_ERRORS = 100;

interface Verdict {
	status: 'rejected' | 'duplicate';
	sha256: string;
	sizeBytes: number;
	summary: SpiParseSummary;
	duplicateOf: number | null;
	archivePath: string | null;
	errors: IngestIssue[];
}

/** Record a rejected or duplicate file on its import row (after its chunk rows were deleted). */
function recordVerdict(conn: Database.Database, importId: number, v: Verdict): void {
	conn
		.prepare(
			`update spi_imports set sha256 = ?, size_bytes = ?, status = ?, duplicate_of_import_id = ?,
			 finished_at = ?, data_rows = ?, boards = 0, pads = 0, rejected_rows = ?,
			 duplicate_boards = 0, error_count = ?, errors = ?, warnings = ?, archive_path = ?,
			 board_id_from = null, board_id_to = null where id = ?`
		)
		.run(
			v.sha256,
			v.sizeBytes,
			v.status,
			v.duplicateOf,
			Date.now(),
			v.summary.dataRows,
			v.summary.rowsRejected,
			v.status === 'rejected' ? Math.max(v.summary.errorCount, v.errors.length) : 0,
			JSON.stringify(v.errors),
			JSON.stringify(v.summary.warnings),
			v.archivePath,
			importId
		);
}

/**
 * Take the file's rows back out and record why: a duplicate keeps no archive copy (the earlier
 * import has it); a rejected file keeps its archive copy under its hash.
 */
export async function refuseImport(
	request: IngestRequest,
	conn: Database.Database,
	writer: BatchWriter,
	file: ReceivedFile,
	duplicateOf: number | null,
	archive: ArchiveWriter
): Promise<IngestOutcome> {
	const { summary, sha256, sizeBytes, writeFailure } = file;
	await discardImportRows(conn, writer.importId);
	if (duplicateOf !== null) {
		archive.discard();
		recordVerdict(conn, writer.importId, {
			status: 'duplicate',
			sha256,
			sizeBytes,
			summary,
			duplicateOf,
			archivePath: null,
			errors: []
		});
		reportDone(request, file, duplicateOf, 'duplicate');
		return { status: 'duplicate', id: duplicateOf, attemptId: writer.importId };
	}
	const archivePath = archive.commit(sha256);
	const errors = (writeFailure ? [writeFailure, ...summary.errors] : summary.errors).slice(
		0,
		KEPT_ERRORS
	);
	recordVerdict(conn, writer.importId, {
		status: 'rejected',
		sha256,
		sizeBytes,
		summary,
		duplicateOf: null,
		archivePath,
		errors
	});
	reportDone(request, file, writer.importId, 'rejected');
	return {
		status: 'rejected',
		id: writer.importId,
		errorCount: summary.errorCount + (writeFailure ? 1 : 0),
		errors
	};
}
