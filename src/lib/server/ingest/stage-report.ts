/** Stage "report": progress of a running import for the upload page (`progress.ts`). */
import type { IngestRequest } from './ingest-types';
import { reportProgress } from './progress';

/** What the receive stage has done so far. */
export interface ReceiveCounts {
	/** Bytes received. */
	sizeBytes: number;
	/** Pad rows written. */
	rows: number;
}

/** Report a running import (only when the request carries a progress key). */
export function reportRunning(
	request: IngestRequest,
	phase: 'receiving' | 'finishing',
	counts: ReceiveCounts,
	boards: number
): void {
	if (!request.job) return;
	reportProgress({
		job: request.job,
		phase,
		fileName: request.fileName,
		bytes: counts.sizeBytes,
		totalBytes: request.totalBytes ?? null,
		rows: counts.rows,
		boards
	});
}

/** Report the verdict on a file: the import id the answer names and its status. */
export function reportDone(
	request: IngestRequest,
	counts: ReceiveCounts,
	importId: number,
	status: 'imported' | 'duplicate' | 'rejected'
): void {
	if (!request.job) return;
	reportProgress({
		job: request.job,
		phase: 'done',
		fileName: request.fileName,
		bytes: counts.sizeBytes,
		totalBytes: request.totalBytes ?? counts.sizeBytes,
		rows: counts.rows,
		boards: 0,
		importId,
		status
	});
}
