/** The shapes of one SPI import: what comes in and the verdict that goes out. */
import type { IngestIssue, MappingProfile } from '$lib/ingest';

/** How a file came in. */
export type IngestSource = 'upload' | 'api' | 'watch';

/** One file to ingest. */
export interface IngestRequest {
	source: IngestSource;
	fileName: string;
	/** The file's bytes in order (a request body, a busboy part, a file stream). */
	body: AsyncIterable<Uint8Array>;
	/** Mapping profile (default: the canonical layout) and its stored id, if any. */
	profile?: MappingProfile;
	profileId?: number | null;
	/** "user:12", "token:3" or "system". */
	createdBy: string;
	userId?: number | null;
	/** For watched files: the path the file was found at. */
	sourcePath?: string | null;
	/** Declared size, for progress (content-length). */
	totalBytes?: number | null;
	/** Progress key (see `progress.ts`); progress is reported only when given. */
	job?: string | null;
	/** Parse on a worker thread: default for files of 8 MB or more (declared size). */
	threaded?: boolean;
	/** Rows per batch handed from the parser to the writer (tests use small ones). */
	batchSize?: number;
}

/** The verdict on one file, shaped like the API's answers. */
export type IngestOutcome =
	| {
			status: 'imported';
			id: number;
			boards: number;
			pads: number;
			rejectedRows: number;
			duplicateBoards: number;
			warnings: IngestIssue[];
			/** Whether the file was parsed on a worker thread. */
			threaded: boolean;
	  }
	| { status: 'duplicate'; id: number; attemptId: number }
	| { status: 'rejected'; id: number; errorCount: number; errors: IngestIssue[] };
