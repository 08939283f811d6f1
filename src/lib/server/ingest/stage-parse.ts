/**
 * Stage "parse on the thread": the parser for one file, on the worker thread for large files
 * (parsing then overlaps with the inserts on this thread, so both cores work), else here.
 */
import { CANONICAL_PROFILE } from '$lib/ingest';
import type { IngestRequest } from './ingest-types';
import { inlineParseDriver, threadedParseDriver, type ParseDriver } from './parse-driver';

/** Below this declared size the worker's start-up (~0.1 s) costs more than it saves. */
const THREAD_MIN_BYTES = 8 * 1024 * 1024;

let warnedNoThread = false;

/**
 * Start the parser of `request`, copying the bytes to the archive temp file `archiveFd`.
 * @throws Error when the profile is invalid (a bad time zone or timestamp pattern).
 */
export async function startParser(request: IngestRequest, archiveFd: number): Promise<ParseDriver> {
	const options = {
		profile: request.profile ?? CANONICAL_PROFILE,
		fileName: request.fileName,
		batchSize: request.batchSize,
		archiveFd
	};
	if (request.threaded ?? (request.totalBytes ?? 0) >= THREAD_MIN_BYTES) {
		const threaded = await threadedParseDriver(options);
		if (threaded) return threaded;
		if (!warnedNoThread) {
			warnedNoThread = true;
			console.warn('[rollbead] SPI parser thread did not start; parsing in the main thread');
		}
	}
	return inlineParseDriver(options);
}
