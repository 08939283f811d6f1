import busboy from 'busboy';
import { Readable } from 'node:stream';
import type { ReadableStream as NodeWebReadableStream } from 'node:stream/web';
import { ApiError } from '../api';

/** One file taken from a request body, still streaming. */
export interface UploadedFile {
	fileName: string;
	/** Form fields that came before the file part (e.g. `profile`). */
	fields: Record<string, string>;
	body: AsyncIterable<Uint8Array>;
}

const MEGABYTE = 1024 * 1024;

/** The 413 answer for a body over the limit. */
export function tooLarge(limitBytes: number, declared?: number): ApiError {
	const limitMb = Math.round(limitBytes / MEGABYTE);
	const what =
		declared !== undefined
			? `The upload is ${(declared / MEGABYTE).toFixed(0)} MB`
			: 'The upload is larger than the limit';
	return new ApiError(413, {
		error: `${what}; the largest accepted file is ${limitMb} MB (MAX_UPLOAD_MB). Split the export into smaller files or ask an administrator to raise MAX_UPLOAD_MB.`
	});
}

/** Refuse a declared content-length above the limit before reading anything. */
export function checkDeclaredSize(request: Request, limitBytes: number): number | null {
	const header = request.headers.get('content-length');
	if (header === null) return null;
	const declared = Number(header);
	if (Number.isFinite(declared) && declared > limitBytes) throw tooLarge(limitBytes, declared);
	return Number.isFinite(declared) ? declared : null;
}

/** Pass chunks through, throwing 413 once more than `limitBytes` have gone by (chunked bodies). */
export async function* limitBytes(
	source: AsyncIterable<Uint8Array>,
	limit: number
): AsyncGenerator<Uint8Array> {
	let seen = 0;
	const it = source[Symbol.asyncIterator]();
	for (;;) {
		let next: IteratorResult<Uint8Array>;
		try {
			next = await it.next();
		} catch (err) {
			// adapter-node's own limit (BODY_SIZE_LIMIT) or a body longer than its content-length.
			if ((err as { status?: number }).status === 413) throw tooLarge(limit);
			// The client went away or the multipart body broke off: nothing of the file is kept.
			throw new ApiError(400, {
				error: `The upload was interrupted before the file was complete (${(err as Error).message}); nothing was imported.`
			});
		}
		if (next.done) return;
		seen += next.value.length;
		if (seen > limit) throw tooLarge(limit);
		yield next.value;
	}
}

/** How far `readAhead` reads before the consumer asks, and the batches it hands on. */
export interface ReadAheadOptions {
	/** Batches handed on are at least this large (the last may be smaller). */
	batchBytes?: number;
	/** Reading pauses once this much waits for the consumer. */
	aheadBytes?: number;
}

/**
 * Read the body ahead of its consumer (up to `aheadBytes`) and hand it on in batches of at least
 * `batchBytes`. Two costs of a socket body go away:
 * - A socket gives chunks of 64 KB or less, and every chunk cost the import a round trip to the
 *   parser thread and an await on each side; 1 MB batches make that negligible, as for files read
 *   from disk.
 * - Read only when asked, the body stalls while the import waits for the parser: the socket is
 *   paused, the sender blocks, and each batch then waits for the sender to be scheduled again
 *   (measured: a third of the wall time on a busy machine). Read ahead, the bytes keep arriving
 *   while the import works.
 * Each batch is a fresh buffer (the bytes are copied once), at most one source chunk over
 * `batchBytes`, so what the parser holds per batch stays bounded. An error of the source is thrown to
 * the consumer after the bytes read before it; stopping early stops the source.
 */
export async function* readAhead(
	source: AsyncIterable<Uint8Array>,
	{ batchBytes = MEGABYTE, aheadBytes = 8 * MEGABYTE }: ReadAheadOptions = {}
): AsyncGenerator<Uint8Array> {
	const it = source[Symbol.asyncIterator]();
	let parts: Uint8Array[] = [];
	let queued = 0;
	let ended = false;
	let failure: { error: unknown } | null = null;
	let stopped = false;
	// One waiter each way: the consumer waiting for bytes, the pump waiting for room.
	let wakeConsumer: (() => void) | null = null;
	let wakePump: (() => void) | null = null;
	const notify = (which: 'consumer' | 'pump') => {
		const wake = which === 'consumer' ? wakeConsumer : wakePump;
		if (which === 'consumer') wakeConsumer = null;
		else wakePump = null;
		wake?.();
	};
	const pump = async () => {
		try {
			while (!stopped) {
				if (queued >= aheadBytes) {
					await new Promise<void>((resolve) => (wakePump = resolve));
					continue;
				}
				const next = await it.next();
				if (next.done) break;
				if (next.value.length === 0) continue;
				parts.push(next.value);
				queued += next.value.length;
				if (queued >= batchBytes) notify('consumer');
			}
		} catch (error) {
			failure = { error };
		}
		ended = true;
		notify('consumer');
	};
	/** The first chunks that make a batch (all of them at the end); the rest stay queued. */
	const take = (): Uint8Array => {
		let count = 0;
		let size = 0;
		while (count < parts.length && size < batchBytes) size += parts[count++].length;
		const batch = new Uint8Array(size);
		let offset = 0;
		for (let i = 0; i < count; i++) {
			batch.set(parts[i], offset);
			offset += parts[i].length;
		}
		parts = parts.slice(count);
		queued -= size;
		notify('pump');
		return batch;
	};
	void pump();
	try {
		for (;;) {
			if (queued >= batchBytes || (ended && queued > 0)) {
				yield take();
				continue;
			}
			if (ended) {
				// Set by the pump (TypeScript cannot see the assignment in the closure).
				const failed = failure as { error: unknown } | null;
				if (failed) throw failed.error;
				return;
			}
			await new Promise<void>((resolve) => (wakeConsumer = resolve));
		}
	} finally {
		if (!ended) {
			stopped = true;
			notify('pump');
			// Best effort: a source busy in `next()` stops at its next step.
			void Promise.resolve(it.return?.()).catch(() => undefined);
		}
	}
}

/** A web stream's chunks; stopping early cancels the stream (and so the upload's socket). */
async function* webStreamChunks(body: ReadableStream<Uint8Array>): AsyncGenerator<Uint8Array> {
	const reader = body.getReader();
	let done = false;
	try {
		for (;;) {
			const next = await reader.read();
			if (next.done) {
				done = true;
				return;
			}
			yield next.value;
		}
	} finally {
		if (!done) void reader.cancel().catch(() => undefined);
	}
}

function nodeStream(request: Request): Readable {
	if (!request.body) throw new ApiError(400, { error: 'The request has no body; send a file.' });
	return Readable.fromWeb(request.body as unknown as NodeWebReadableStream<Uint8Array>);
}

/**
 * The first file part of a multipart/form-data request, streamed with busboy (never buffered:
 * `request.formData()` would hold the whole file in memory). Fields before the file (such as
 * `profile`) are returned with it; later files are drained and ignored.
 * @throws ApiError 400 when the body is not multipart or has no file part.
 */
export function multipartFile(request: Request, fileField = 'file'): Promise<UploadedFile> {
	const headers = Object.fromEntries(request.headers.entries());
	let bb: busboy.Busboy;
	try {
		bb = busboy({ headers, limits: { files: 1, fields: 20, fieldSize: 64 * 1024 } });
	} catch (err) {
		throw new ApiError(400, {
			error: `The multipart body cannot be read: ${(err as Error).message}.`
		});
	}
	const fields: Record<string, string> = {};
	return new Promise<UploadedFile>((resolve, reject) => {
		let found = false;
		bb.on('field', (name, value) => {
			fields[name] = value;
		});
		bb.on('file', (name, stream, info) => {
			if (found || name !== fileField) {
				stream.resume();
				return;
			}
			found = true;
			resolve({ fileName: info.filename || 'upload.csv', fields: { ...fields }, body: stream });
		});
		bb.on('error', (err) => {
			if (!found)
				reject(
					new ApiError(400, {
						error: `The multipart body cannot be read: ${(err as Error).message}.`
					})
				);
		});
		bb.on('close', () => {
			if (!found)
				reject(
					new ApiError(400, {
						error: `The form has no "${fileField}" part; send the file as multipart field "${fileField}".`
					})
				);
		});
		const source = nodeStream(request);
		source.on('error', (err) => bb.destroy(err));
		source.pipe(bb);
	});
}

/** A raw (text/csv) request body as chunks; no body at all is an empty file (422, not 400). */
export function rawBody(request: Request): AsyncIterable<Uint8Array> {
	if (!request.body) return (async function* () {})();
	return webStreamChunks(request.body);
}
