/**
 * The one SPI ingest: every way in (upload, API, watched folder, IPC-CFX) calls `ingestSpiFile`.
 * An import is a pipeline of stages, each in a module of its own:
 *
 * 1. parse on the thread (`stage-parse.ts`, the parser in `parse-driver.ts`);
 * 2. open the import row (`import-row.ts`) and its writer (`batch-writer.ts`; each board resolved
 *    against lines, print runs and stencils by `board-resolver.ts`);
 * 3. receive the bytes and store the rows in short chunk transactions (`stage-receive.ts`);
 * 4. commit a good, new file in one short transaction (`stage-commit.ts`);
 * 5. evaluate the charts over its boards (`stage-evaluate.ts`), or record why it was refused
 *    (`stage-verdict.ts`); progress is reported throughout (`stage-report.ts`).
 */
import type Database from 'better-sqlite3';
import type { Db } from '../db';
import { openArchiveWriter } from './archive';
import { createBatchWriter, type BatchWriter } from './batch-writer';
import { checkpointAndClose, inWriteTransaction, openIngestConnection } from './import-connection';
import { discardImportRows } from './import-rollback';
import { openImportRow } from './import-row';
import type { IngestOutcome, IngestRequest } from './ingest-types';
import { commitImport } from './stage-commit';
import { evaluateImport } from './stage-evaluate';
import { startParser } from './stage-parse';
import { receiveFile } from './stage-receive';
import { reportDone } from './stage-report';
import { refuseImport } from './stage-verdict';

export type { IngestOutcome, IngestRequest, IngestSource } from './ingest-types';
export { recoverInterruptedImports } from './import-rollback';

let queue: Promise<unknown> = Promise.resolve();

/**
 * Ingest one SPI file: stream it through the parser, write its pad measurements, pad dictionary
 * entries and boards, archive the original under its SHA-256, and record the import. A file with
 * a bad row (under the default policy), a file-level error or the same content as an earlier
 * import keeps nothing of its data; board inspections already stored (serial + inspected_at) are
 * skipped and counted. Imports run one at a time (a queue).
 *
 * Isolation without a long lock: pad rows are committed in short chunks (`CHUNK_ROWS`, each
 * transaction within one event-loop turn) against spi_boards ids this import reserves (recorded
 * on its spi_imports row, status 'importing'). Readers reach pad rows only through spi_boards, and
 * the board rows, new pad dictionary entries, per-board aggregates and the status 'imported' are
 * written in ONE final short transaction, so no reader ever sees part of an import. A rejected,
 * duplicate or failed file deletes its chunk rows (in chunks too); an import cut short by a
 * crash is cleaned up at start-up (`recoverInterruptedImports`). Other writers (sign-in, API
 * tokens, print runs) never wait for an import: no transaction stays open across an await.
 * @throws only for server faults (disk full, database closed); file content never throws.
 * @example
 * const outcome = await ingestSpiFile(db, { source: 'api', fileName: 'a.csv', body: stream, createdBy: 'user:1' });
 * outcome.status // 'imported' | 'duplicate' | 'rejected'
 */
export function ingestSpiFile(db: Db, request: IngestRequest): Promise<IngestOutcome> {
	const run = queue.then(() => ingestNow(db, request));
	queue = run.catch(() => undefined);
	return run;
}

async function ingestNow(db: Db, request: IngestRequest): Promise<IngestOutcome> {
	const startedAt = Date.now();
	const { conn, own } = openIngestConnection(db);
	const archive = openArchiveWriter(db.$client.name);
	let closeParser = () => Promise.resolve();
	let writer: BatchWriter | null = null;
	try {
		const parser = await startParser(request, archive.fd);
		closeParser = parser.close;
		const w = (writer = await inWriteTransaction(conn, () =>
			createBatchWriter(db, conn, openImportRow(conn, request, startedAt))
		));
		const file = await receiveFile(request, parser, conn, w);
		const { stored, duplicateOf } = await commitImport(conn, w, file, archive);
		if (!stored) return await refuseImport(request, conn, w, file, duplicateOf, archive);
		reportDone(request, file, w.importId, 'imported');
		await evaluateImport(db, w.importId, stored.boardIds);
		return {
			status: 'imported',
			id: w.importId,
			boards: stored.boards,
			pads: stored.pads,
			rejectedRows: file.summary.rowsRejected,
			duplicateBoards: stored.duplicateBoards,
			warnings: file.summary.warnings,
			threaded: parser.threaded
		};
	} catch (err) {
		if (conn.inTransaction) conn.exec('ROLLBACK');
		// The parser thread writes the archive file: stop it before the file is closed.
		await closeParser();
		archive.discard();
		if (writer) await removeFailedImport(conn, writer.importId);
		throw err;
	} finally {
		await closeParser();
		if (own) setImmediate(() => checkpointAndClose(conn));
	}
}

/**
 * After a fault (disk full, closed database): remove what was written; if even that fails, the
 * row stays 'importing' and the next start-up removes it.
 */
async function removeFailedImport(conn: Database.Database, importId: number) {
	try {
		await discardImportRows(conn, importId);
		conn.prepare(`delete from spi_imports where id = ? and status = 'importing'`).run(importId);
	} catch (cleanupErr) {
		console.warn(
			'[rollbead] could not remove the rows of a failed SPI import (removed at the next start):',
			(cleanupErr as Error).message
		);
	}
}
