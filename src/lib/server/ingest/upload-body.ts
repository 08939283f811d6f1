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
	return nodeStream(request);
}
