import { isMainThread, parentPort, Worker, workerData } from 'node:worker_threads';
import {
	createSpiRowParser,
	type MappingProfile,
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
}

const WORKER_FLAG = 'rollbeadSpiParser';

/** The parser in this thread. */
export function inlineParseDriver(options: ParserOptions): ParseDriver {
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

/** Start a parser thread and wait for it to be ready; null when it cannot start in time. */
async function startParserThread(timeoutMs: number): Promise<Worker | null> {
	let worker: Worker;
	try {
		const self = import.meta.url;
		const data = { workerData: { [WORKER_FLAG]: true } };
		// From TypeScript sources (tsx, vitest) the worker loads this file through tsx's loader,
		// which a worker does not inherit; the built app runs its own .js chunk directly.
		worker = self.endsWith('.ts')
			? new Worker(
					`import('tsx/esm/api').then((m) => { m.register(); return import(${JSON.stringify(self)}); });`,
					{ ...data, eval: true }
				)
			: new Worker(new URL(self), data);
	} catch {
		return null;
	}
	const started = await new Promise<boolean>((resolve) => {
		const timer = setTimeout(() => resolve(false), timeoutMs);
		worker.once('message', (m: Reply) => {
			clearTimeout(timer);
			resolve(m.type === 'ready');
		});
		worker.once('error', () => {
			clearTimeout(timer);
			resolve(false);
		});
	});
	if (!started) {
		void worker.terminate();
		return null;
	}
	// A spare that stops on its own is simply forgotten.
	worker.on('exit', () => {
		if (spareWorker === worker) spareWorker = null;
	});
	worker.on('error', () => undefined);
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
	const worker = await startParserThread(timeoutMs);
	if (!worker) return;
	if (spareWorker) void worker.terminate();
	else {
		worker.unref();
		spareWorker = worker;
	}
}

/**
 * The parser on a worker thread, or `null` when the worker cannot start within `timeoutMs`
 * (the caller then uses `inlineParseDriver`).
 * @throws Error when the profile is invalid (same as `createSpiRowParser`).
 */
export async function threadedParseDriver(
	options: ParserOptions,
	timeoutMs = 10_000
): Promise<ParseDriver | null> {
	// Validate the profile here, so a bad one fails the same way in both modes.
	createSpiRowParser(options);
	const worker = spareWorker ?? (await startParserThread(timeoutMs));
	if (spareWorker === worker) spareWorker = null;
	if (!worker) return null;
	worker.ref();
	const waiting: { resolve: (r: Reply) => void; reject: (e: Error) => void }[] = [];
	let failed: Error | null = null;
	let finished = false; // the digest is in: the thread has written its last byte
	let boards = 0;
	const fail = (err: Error) => {
		failed ??= err;
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
	const batchesOf = async (p: Promise<Reply>) => {
		const r = await p;
		return r.type === 'batches' ? r.batches : [];
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
			// A private copy is transferred (the caller's buffer may be pooled and reused).
			const copy = chunk.slice();
			return batchesOf(request({ type: 'chunk', bytes: copy }, [copy.buffer as ArrayBuffer]));
		},
		end: () => batchesOf(request({ type: 'end' })),
		async summary() {
			const r = await request({ type: 'summary' });
			if (r.type !== 'summary') throw new Error('SPI parser thread answered out of order');
			return r.summary;
		},
		async digest() {
			const r = await request({ type: 'digest' });
			if (r.type !== 'digest') throw new Error('SPI parser thread answered out of order');
			finished = true;
			return r.sha256;
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
			} else {
				await worker.terminate();
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

if (!isMainThread && (workerData as Record<string, unknown> | null)?.[WORKER_FLAG] === true) {
	runParseWorker();
}
