import { createHash } from 'node:crypto';
import { read, writeSync } from 'node:fs';
import { promisify } from 'node:util';
import { parentPort, type Worker } from 'node:worker_threads';
import { isModuleThread, startModuleThread } from '../module-thread';
import {
	createSpiRowParser,
	spiParseLimitsFromEnv,
	type MappingProfile,
	type SpiParseLimits,
	type SpiParseSummary,
	type SpiRowBatch,
	type SpiRowParser
} from '$lib/ingest';
import { openArchiveSink, type ArchiveSink } from './archive';

/**
 * Runs the SPI parser for one file, either on a worker thread (large files: parsing then
 * overlaps with the SQLite inserts on the main thread, so both cores work) or in this thread.
 * The same thread hashes the bytes (SHA-256) and writes them to the archive temp file, which
 * keeps that work off the inserting thread too.
 * Pushes return promises that resolve, in order, with the batches each chunk completed; the
 * caller keeps a few in flight, which bounds memory (no more than that many chunks queued).
 *
 * The worker runs this very module (its own `import.meta.url`: the built chunk in production,
 * the TypeScript file under tsx); when that cannot start (e.g. under Vite's dev server, where
 * the file is TypeScript without a loader) the parser runs in this thread instead.
 *
 * The thread has a memory ceiling (`SPI_PARSE_MEMORY_MB`, default 512): a file that needs more
 * ends the thread, not the server. The file is then rejected (`summary()` names the limit), its
 * archive copy and hash are completed from this side, and the next file gets a new thread.
 */
export interface ParseDriver {
	push(chunk: Uint8Array): Promise<SpiRowBatch[]>;
	end(): Promise<SpiRowBatch[]>;
	summary(): Promise<SpiParseSummary>;
	/** SHA-256 (hex) of all pushed bytes; ask once, last (after `end` and `summary`). */
	digest(): Promise<string>;
	/** Board inspections seen so far (progress display). */
	boardsSeen(): number;
	/** Whether the parser runs on a worker thread. */
	readonly threaded: boolean;
	/** Stop the parser; resolves once its thread can no longer write to the archive file. */
	close(): Promise<void>;
}

interface ParserOptions {
	profile: MappingProfile;
	fileName: string;
	batchSize?: number;
	/** Open archive temp file (`ArchiveWriter.fd`) the pushed bytes are copied to. */
	archiveFd: number;
	/** Parse budgets; from the environment (`spiParseLimitsFromEnv`) when absent. */
	limits?: Partial<SpiParseLimits>;
}

const WORKER_FLAG = 'rollbeadSpiParser';

/** Default memory ceiling of the parser thread's heap, MB (`SPI_PARSE_MEMORY_MB`). */
export const DEFAULT_PARSE_MEMORY_MB = 512;

const warned = new Set<string>();
function warnOnce(message: string): void {
	if (warned.has(message)) return;
	warned.add(message);
	console.warn(`[rollbead] ${message}`);
}

/** Parse budgets from the environment, read per file (a bad value is logged once). */
function limitsFromEnv(): SpiParseLimits {
	const { limits, problems } = spiParseLimitsFromEnv(process.env);
	for (const p of problems) warnOnce(p);
	return limits;
}

/** The parser thread's heap ceiling in MB: `SPI_PARSE_MEMORY_MB` (plain digits, ≥ 64) or 512. */
export function parseMemoryMb(env: Record<string, string | undefined> = process.env): number {
	const raw = env.SPI_PARSE_MEMORY_MB?.trim();
	if (raw === undefined || raw === '') return DEFAULT_PARSE_MEMORY_MB;
	const value = /^[0-9]{1,7}$/.test(raw) ? Number(raw) : NaN;
	if (!(value >= 64)) {
		warnOnce(
			`SPI_PARSE_MEMORY_MB=${JSON.stringify(raw)} is not a whole number of at least 64; using ${DEFAULT_PARSE_MEMORY_MB}`
		);
		return DEFAULT_PARSE_MEMORY_MB;
	}
	return value;
}

function withLimits(options: ParserOptions): ParserOptions {
	return options.limits ? options : { ...options, limits: limitsFromEnv() };
}

/** The parser in this thread. */
export function inlineParseDriver(givenOptions: ParserOptions): ParseDriver {
	const options = withLimits(givenOptions);
	const parser = createSpiRowParser(options);
	const sink = openArchiveSink(options.archiveFd);
	return {
		threaded: false,
		push(chunk) {
			sink.write(chunk);
			return Promise.resolve(parser.push(chunk));
		},
		end: () => Promise.resolve(parser.end()),
		summary: () => Promise.resolve(parser.summary()),
		digest: () => Promise.resolve(sink.digest()),
		boardsSeen: () => parser.boards().length,
		close: () => Promise.resolve()
	};
}

type Reply =
	| { type: 'ready' }
	| { type: 'opened' }
	| { type: 'batches'; batches: SpiRowBatch[]; boards: number }
	| { type: 'summary'; summary: SpiParseSummary }
	| { type: 'digest'; sha256: string }
	| { type: 'fatal'; message: string };

/**
 * One parser thread is kept after a file that finished cleanly, for the next file: starting a
 * thread costs 0.1–0.3 s in the built app (seconds under tsx), which a warm one saves.
 */
let spareWorker: Worker | null = null;

/** Heap ceiling of the spare thread, so a file that asks for another ceiling starts its own. */
let spareMemoryMb = 0;

/** Start a parser thread and wait for it to be ready; null when it cannot start in time. */
async function startParserThread(timeoutMs: number, memoryMb: number): Promise<Worker | null> {
	const worker = await startModuleThread({
		moduleUrl: import.meta.url,
		flag: WORKER_FLAG,
		// A runaway file ends this thread (ERR_WORKER_OUT_OF_MEMORY), not the server.
		resourceLimits: { maxOldGenerationSizeMb: memoryMb },
		startTimeoutMs: timeoutMs
	});
	if (!worker) return null;
	// A spare that stops on its own is simply forgotten.
	worker.on('exit', () => {
		if (spareWorker === worker) spareWorker = null;
	});
	return worker;
}

/** Thread id of the spare parser thread, or null when none waits (for tests and diagnostics). */
export function spareParserThreadId(): number | null {
	return spareWorker?.threadId ?? null;
}

/**
 * Start the parser thread ahead of the first large file (server start-up, benchmarks), so that
 * file does not wait for it. Harmless when a spare thread already exists.
 */
export async function warmParserThread(timeoutMs = 10_000): Promise<void> {
	if (spareWorker) return;
	const memoryMb = parseMemoryMb();
	const worker = await startParserThread(timeoutMs, memoryMb);
	if (!worker) return;
	if (spareWorker) void worker.terminate();
	else {
		worker.unref();
		spareWorker = worker;
		spareMemoryMb = memoryMb;
	}
}

/** What a rejected file says when its parser thread stopped. */
function threadFailureMessage(err: Error & { code?: string }, memoryMb: number): string {
	if (err.code === 'ERR_WORKER_OUT_OF_MEMORY') {
		return `reading this file needed more than the parser's memory limit of ${memoryMb} MB (SPI_PARSE_MEMORY_MB) and was stopped; nothing was imported. Split the export, or raise the limit`;
	}
	return `the parser stopped on this file (${err.message}); nothing was imported`;
}

/** The summary of a file whose parser thread stopped: rejected as a whole, with the reason. */
function failedSummary(fileName: string, message: string): SpiParseSummary {
	return {
		ok: false,
		fileName,
		delimiter: null,
		header: [],
		dataRows: 0,
		rowsAccepted: 0,
		rowsRejected: 0,
		errorCount: 1,
		errors: [{ row: 0, column: null, message }],
		warningCount: 0,
		warnings: [],
		boards: []
	};
}

const readAt = promisify(read);

/** SHA-256 of the first `length` bytes of an open file, read in pieces (the loop stays free). */
async function hashFile(fd: number, length: number): Promise<string> {
	const hash = createHash('sha256');
	const buffer = Buffer.alloc(1024 * 1024);
	let position = 0;
	while (position < length) {
		const want = Math.min(buffer.length, length - position);
		const { bytesRead } = await readAt(fd, buffer, 0, want, position);
		if (bytesRead === 0) throw new Error('archive temp file is shorter than the bytes received');
		hash.update(buffer.subarray(0, bytesRead));
		position += bytesRead;
	}
	return hash.digest('hex');
}

function writeAt(fd: number, bytes: Uint8Array, position: number): void {
	let off = 0;
	while (off < bytes.length) off += writeSync(fd, bytes, off, bytes.length - off, position + off);
}

/**
 * The parser on a worker thread, or `null` when the worker cannot start within `timeoutMs`
 * (the caller then uses `inlineParseDriver`).
 * @throws Error when the profile is invalid (same as `createSpiRowParser`).
 */
export async function threadedParseDriver(
	givenOptions: ParserOptions,
	timeoutMs = 10_000,
	memoryMb = parseMemoryMb()
): Promise<ParseDriver | null> {
	const options = withLimits(givenOptions);
	// Validate the profile here, so a bad one fails the same way in both modes.
	createSpiRowParser(options);
	const spare = spareWorker !== null && spareMemoryMb === memoryMb ? spareWorker : null;
	const worker = spare ?? (await startParserThread(timeoutMs, memoryMb));
	if (spare !== null && spareWorker === spare) spareWorker = null;
	if (!worker) return null;
	worker.ref();
	const waiting: { resolve: (r: Reply) => void; reject: (e: Error) => void }[] = [];
	let failed: Error | null = null;
	let finished = false; // the digest is in: the thread has written its last byte
	let boards = 0;
	// Bytes sent so far (the archive offset of the next chunk), and the chunks the thread has not
	// answered yet: if it stops, they are written again at their offsets (a chunk may or may not
	// have reached the file), so the archive copy and its hash stay whole.
	let sentBytes = 0;
	const unanswered = new Set<{ position: number; bytes: Uint8Array }>();
	// Set once the thread has stopped mid-file: the file is rejected and this side finishes it.
	let stopped: Promise<void> | null = null;
	let failureMessage = '';
	const fail = (err: Error) => {
		failed ??= err;
		if (stopped === null) {
			failureMessage = threadFailureMessage(failed, memoryMb);
			stopped = worker.terminate().then(
				() => {
					for (const c of unanswered) writeAt(options.archiveFd, c.bytes, c.position);
					unanswered.clear();
				},
				() => undefined
			);
		}
		for (const w of waiting.splice(0)) w.reject(failed);
	};
	const onMessage = (m: Reply) => {
		if (m.type === 'fatal') return fail(new Error(`SPI parser thread failed: ${m.message}`));
		if (m.type === 'batches') boards = m.boards;
		waiting.shift()?.resolve(m);
	};
	const onError = (err: Error) => fail(err);
	const onExit = (code: number) => fail(new Error(`SPI parser thread stopped (exit code ${code})`));
	worker.on('message', onMessage);
	worker.on('error', onError);
	worker.on('exit', onExit);
	const request = (message: unknown, transfer: ArrayBuffer[] = []) =>
		new Promise<Reply>((resolve, reject) => {
			if (failed) return reject(failed);
			waiting.push({ resolve, reject });
			worker.postMessage(message, transfer);
		});
	/** A request's batches; none once the thread has stopped (the file is rejected then). */
	const batchesOf = async (p: Promise<Reply>) => {
		try {
			const r = await p;
			return r.type === 'batches' ? r.batches : [];
		} catch (err) {
			if (stopped === null) throw err;
			await stopped;
			return [];
		}
	};
	try {
		const opened = await request({ type: 'open', options });
		if (opened.type !== 'opened') throw new Error('SPI parser thread answered out of order');
	} catch {
		void worker.terminate();
		return null;
	}
	return {
		threaded: true,
		push(chunk) {
			const position = sentBytes;
			sentBytes += chunk.length;
			if (stopped !== null) {
				// The thread is gone: this side keeps the archive copy whole from here (in order,
				// after the rewrites; `digest` waits for the chain).
				const bytes = chunk.slice();
				stopped = stopped.then(() => writeAt(options.archiveFd, bytes, position));
				return stopped.then(() => []);
			}
			// A private copy is transferred (the caller's buffer may be pooled and reused), and a
			// second kept until the thread answers for it.
			const copy = chunk.slice();
			const kept = { position, bytes: chunk.slice() };
			unanswered.add(kept);
			const reply = request({ type: 'chunk', bytes: copy }, [copy.buffer as ArrayBuffer]);
			reply.then(
				() => unanswered.delete(kept),
				() => undefined
			);
			return batchesOf(reply);
		},
		end: () => batchesOf(request({ type: 'end' })),
		async summary() {
			try {
				const r = await request({ type: 'summary' });
				if (r.type !== 'summary') throw new Error('SPI parser thread answered out of order');
				return r.summary;
			} catch (err) {
				if (stopped === null) throw err;
				return failedSummary(options.fileName, failureMessage);
			}
		},
		async digest() {
			try {
				const r = await request({ type: 'digest' });
				if (r.type !== 'digest') throw new Error('SPI parser thread answered out of order');
				finished = true;
				return r.sha256;
			} catch (err) {
				if (stopped === null) throw err;
				await stopped;
				return hashFile(options.archiveFd, sentBytes);
			}
		},
		boardsSeen: () => boards,
		async close() {
			worker.off('message', onMessage);
			worker.off('error', onError);
			worker.off('exit', onExit);
			// Reused only when it is idle and done with the file; otherwise it is stopped before the
			// caller closes the archive file it may still be writing to.
			if (finished && !failed && waiting.length === 0 && spareWorker === null) {
				worker.unref();
				spareWorker = worker;
				spareMemoryMb = memoryMb;
			} else {
				await worker.terminate();
				if (stopped !== null) {
					await stopped;
					// The next large file should not wait for a new thread either.
					void warmParserThread();
				}
			}
		}
	};
}

/** Worker side: one file at a time; parse chunks as they come and send each chunk's batches back. */
function runParseWorker(): void {
	const port = parentPort;
	if (!port) return;
	let parser: SpiRowParser | null = null;
	let sink: ArchiveSink | null = null;
	const send = (batches: SpiRowBatch[]) => {
		const transfer: ArrayBuffer[] = [];
		for (const b of batches)
			for (const a of [
				b.line,
				b.boardIndex,
				b.panelIndex,
				b.volumePct,
				b.areaPct,
				b.heightUm,
				b.offsetXUm,
				b.offsetYUm,
				b.volumeUm3,
				b.result
			])
				if (!transfer.includes(a.buffer as ArrayBuffer)) transfer.push(a.buffer as ArrayBuffer);
		port.postMessage({ type: 'batches', batches, boards: parser?.boards().length ?? 0 }, transfer);
	};
	port.on('message', (m: { type: string; bytes?: Uint8Array; options?: ParserOptions }) => {
		try {
			if (m.type === 'open') {
				const options = m.options as ParserOptions;
				parser = createSpiRowParser(options);
				sink = openArchiveSink(options.archiveFd);
				port.postMessage({ type: 'opened' });
				return;
			}
			if (!parser || !sink) throw new Error(`"${m.type}" before "open"`);
			if (m.type === 'chunk') {
				sink.write(m.bytes as Uint8Array);
				send(parser.push(m.bytes as Uint8Array));
			} else if (m.type === 'end') send(parser.end());
			else if (m.type === 'summary')
				port.postMessage({ type: 'summary', summary: parser.summary() });
			else if (m.type === 'digest') {
				port.postMessage({ type: 'digest', sha256: sink.digest() });
				parser = null;
				sink = null;
			}
		} catch (err) {
			port.postMessage({ type: 'fatal', message: (err as Error).message });
		}
	});
	port.postMessage({ type: 'ready' });
}

if (isModuleThread(WORKER_FLAG)) {
	runParseWorker();
}
