/**
 * Stage "receive and store in batches": the file's bytes go to the parser as they arrive, and the
 * batches it hands back are written in short chunk transactions (`CHUNK_ROWS`), each opened and
 * committed within one turn of the event loop, never across an await.
 */
import type Database from 'better-sqlite3';
import type { IngestIssue, SpiParseSummary, SpiRowBatch } from '$lib/ingest';
import type { BatchWriter } from './batch-writer';
import { inWriteTransaction } from './import-connection';
import type { IngestRequest } from './ingest-types';
import type { ParseDriver } from './parse-driver';
import { reportRunning, type ReceiveCounts } from './stage-report';

/**
 * Pad rows written per short write transaction (~5-10 ms of work, so requests arriving meanwhile
 * wait at most that long: bench:responsive prints the figures). A transaction is opened and
 * committed within one turn of the event loop, never across an await, so other connections of
 * this process never find the database locked and other processes wait at most one chunk.
 */
const CHUNK_ROWS = 4096;
/** How often a running import reports progress, ms. */
const PROGRESS_EVERY_MS = 200;

/** A file received whole: what the parser found and what was written. */
export interface ReceivedFile extends ReceiveCounts {
	summary: SpiParseSummary;
	sha256: string;
	/** The first write failure (a pad twice on one board), which rejects the file. */
	writeFailure: IngestIssue | null;
}

/**
 * Stream `request.body` through `parser` into `writer`; a few chunks stay in flight on a parser
 * thread (both threads busy; the cap bounds memory).
 */
export async function receiveFile(
	request: IngestRequest,
	parser: ParseDriver,
	conn: Database.Database,
	writer: BatchWriter
): Promise<ReceivedFile> {
	const counts: ReceiveCounts = { sizeBytes: 0, rows: 0 };
	const progress = (phase: 'receiving' | 'finishing') =>
		reportRunning(request, phase, counts, parser.boardsSeen());
	// Batches wait here until a chunk's worth is ready; then one short transaction writes them.
	const held: SpiRowBatch[] = [];
	let heldRows = 0;
	const writeHeld = async () => {
		while (held.length > 0) {
			// At most about CHUNK_ROWS per transaction, then a turn of the event loop for others.
			let take = 0;
			let taken = 0;
			while (take < held.length && (taken === 0 || taken + held[take].length <= CHUNK_ROWS)) {
				taken += held[take].length;
				take++;
			}
			const batches = held.splice(0, take);
			heldRows -= taken;
			await inWriteTransaction(conn, () => {
				for (const batch of batches) {
					writer.write(batch);
					counts.rows += batch.length;
				}
				writer.flush();
				writer.reserve();
			});
			if (held.length > 0) await new Promise((resolve) => setImmediate(resolve));
		}
	};
	const writeAll = async (batches: SpiRowBatch[]) => {
		for (const batch of batches) {
			held.push(batch);
			heldRows += batch.length;
		}
		if (heldRows >= CHUNK_ROWS) await writeHeld();
	};
	progress('receiving');
	let lastReport = 0;
	const inFlight: Promise<SpiRowBatch[]>[] = [];
	for await (const chunk of request.body) {
		const bytes = chunk instanceof Uint8Array ? chunk : new Uint8Array(chunk);
		counts.sizeBytes += bytes.length;
		inFlight.push(parser.push(bytes));
		while (inFlight.length > (parser.threaded ? 2 : 0))
			await writeAll(await (inFlight.shift() as Promise<SpiRowBatch[]>));
		if (request.job && Date.now() - lastReport > PROGRESS_EVERY_MS) {
			lastReport = Date.now();
			progress('receiving');
		}
	}
	while (inFlight.length > 0) await writeAll(await (inFlight.shift() as Promise<SpiRowBatch[]>));
	await writeAll(await parser.end());
	await writeHeld();
	progress('finishing');
	const summary = await parser.summary();
	// Last request: the parser thread is then done with this file (and may take the next).
	const sha256 = await parser.digest();
	return { ...counts, summary, sha256, writeFailure: writer.failure() };
}
