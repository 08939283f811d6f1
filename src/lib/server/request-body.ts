import { json } from '@sveltejs/kit';
import { fileBodyLimitBytes, jsonBodyLimitBytes } from './env-defaults';
import { Refusal } from '$lib/errors';

/**
 * Body limits, per route. Every body is counted on the stream, whether or not the client sent a
 * Content-Length (a chunked body is otherwise read whole before any limit applies):
 * - `stream`: SPI uploads. The import reads the body as a stream and adapter-node stops it at
 *   BODY_SIZE_LIMIT (MAX_UPLOAD_MB plus headroom); the ingest answers 413 with the file named.
 * - `file`: routes that take a stencil file or a study's values (MAX_FILE_MB, default 25 MB).
 * - `small`: everything else, JSON and forms (MAX_JSON_KB, default 1 MB).
 */
export type BodyLimitKind = 'stream' | 'file' | 'small';

const STREAMED_ROUTES = new Set(['/api/spi/imports']);
const FILE_ROUTES = new Set([
	'/api/stencils',
	'/api/stencils/[id=id]/apertures',
	'/(app)/stencils',
	'/(app)/stencils/[id=id]',
	'/(app)/study',
	'/api/spc/analyze'
]);

export function bodyLimitKind(routeId: string | null): BodyLimitKind {
	if (routeId && STREAMED_ROUTES.has(routeId)) return 'stream';
	if (routeId && FILE_ROUTES.has(routeId)) return 'file';
	return 'small';
}

export function bodyLimitBytes(kind: Exclude<BodyLimitKind, 'stream'>): number {
	return kind === 'file' ? fileBodyLimitBytes() : jsonBodyLimitBytes();
}

/** "1 MB", "512 KB": a limit as people read it. */
export function describeBytes(bytes: number): string {
	const mb = bytes / (1024 * 1024);
	return mb >= 1 ? `${Number(mb.toFixed(1))} MB` : `${Math.round(bytes / 1024)} KB`;
}

export class BodyTooLargeError extends Refusal {
	readonly status = 413 as const;
	constructor(readonly limitBytes: number) {
		super(
			`The request body is larger than the limit of ${describeBytes(limitBytes)} for this route.`
		);
	}
}

/**
 * After a refusal the rest of the body is read and dropped for a while, up to this many bytes,
 * before the connection is cut: cutting at once resets the socket, and a reset makes the client's
 * system discard the 413 answer it has not read yet, so the sender would see only "connection
 * reset". Dropped bytes cost no memory; a client still sending past this is cut off.
 */
const DISCARD_AFTER_REFUSAL_BYTES = 64 * 1024 * 1024;

function discardRest(reader: ReadableStreamDefaultReader<Uint8Array>, maxBytes: number): void {
	let dropped = 0;
	const next = (): Promise<void> =>
		reader.read().then(({ done, value }) => {
			if (done) return;
			dropped += value.byteLength;
			if (dropped > maxBytes) return reader.cancel();
			return next();
		});
	next().catch(() => undefined);
}

/**
 * Read a whole body, but never more than `limitBytes`: the stream is cancelled as soon as the
 * count passes the limit, so a client streaming gigabytes costs at most the limit in memory.
 * @throws BodyTooLargeError
 */
export async function readBoundedBody(
	body: ReadableStream<Uint8Array>,
	limitBytes: number
): Promise<Uint8Array> {
	const reader = body.getReader();
	const chunks: Uint8Array[] = [];
	let size = 0;
	for (;;) {
		const { done, value } = await reader.read();
		if (done) break;
		size += value.byteLength;
		if (size > limitBytes) {
			discardRest(reader, DISCARD_AFTER_REFUSAL_BYTES);
			throw new BodyTooLargeError(limitBytes);
		}
		chunks.push(value);
	}
	if (chunks.length === 1) return chunks[0];
	const out = new Uint8Array(size);
	let offset = 0;
	for (const chunk of chunks) {
		out.set(chunk, offset);
		offset += chunk.byteLength;
	}
	return out;
}

/**
 * The request as the route will see it: its body read within the route's limit and held in
 * memory (small by construction), or a 413 answer. Streamed routes and bodiless requests pass
 * through untouched.
 */
export async function boundRequestBody(
	request: Request,
	routeId: string | null,
	isApi: boolean
): Promise<Request | Response> {
	const kind = bodyLimitKind(routeId);
	if (kind === 'stream' || !request.body) return request;
	const limit = bodyLimitBytes(kind);
	const tooLarge = () => {
		const message = new BodyTooLargeError(limit).message;
		return isApi
			? json({ error: message }, { status: 413 })
			: new Response(message, { status: 413 });
	};
	const declared = request.headers.get('content-length');
	if (declared !== null && Number(declared) > limit) return tooLarge();
	let bytes: Uint8Array;
	try {
		bytes = await readBoundedBody(request.body, limit);
	} catch (err) {
		if (err instanceof BodyTooLargeError) return tooLarge();
		// The client went away or sent a broken chunked body: nothing to answer to.
		return isApi
			? json({ error: 'The request body could not be read.' }, { status: 400 })
			: new Response('The request body could not be read.', { status: 400 });
	}
	return new Request(request.url, {
		method: request.method,
		headers: request.headers,
		// Chunks from the socket are plain ArrayBuffer-backed arrays; the cast only narrows the type.
		body: bytes as Uint8Array<ArrayBuffer>,
		signal: request.signal
	});
}
