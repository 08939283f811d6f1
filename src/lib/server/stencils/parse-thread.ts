import { parentPort, type Worker } from 'node:worker_threads';
import { isModuleThread, startModuleThread } from '../module-thread';
import type { StencilLimits } from '$lib/stencil/limits';
import { parseApertureUpload, type UploadInput, type UploadResult } from './upload';

/**
 * Stencil file parsing (Gerber, aperture CSV, centroid CSV) on a worker thread, with a heap
 * ceiling (`resourceLimits`) and a deadline after which the thread is ended: a file that makes
 * the parser run away ends its thread and is answered 413, while the server goes on answering
 * every other request. The budgets in `limits.ts` refuse the known expensive inputs before any
 * work; these ceilings catch whatever slips past them.
 *
 * As in `../ingest/parse-driver.ts`, the worker runs this very module (its own
 * `import.meta.url`: the built chunk in production, the TypeScript file through tsx's loader
 * under vitest); where it cannot start (Vite's dev server) the parse runs in this thread.
 */

const WORKER_FLAG = 'rollbeadStencilParser';

/** Parser threads at once; more uploads wait their turn (the machine has few cores). */
const MAX_THREADS = 2;

/** How long a new thread may take to load its module before the parse runs inline. */
const START_TIMEOUT_MS = 15_000;

type Reply =
	{ type: 'ready' } | { type: 'result'; result: UploadResult } | { type: 'fatal'; message: string };

/** An idle thread kept for the next upload (starting one costs 0.1–0.3 s in the built app). */
let spare: Worker | null = null;
let running = 0;
const queue: (() => void)[] = [];

async function slot(): Promise<() => void> {
	if (running >= MAX_THREADS) await new Promise<void>((resolve) => queue.push(resolve));
	running++;
	return () => {
		running--;
		queue.shift()?.();
	};
}

function heapOptions(limits: StencilLimits) {
	return {
		resourceLimits: {
			maxOldGenerationSizeMb: limits.parseHeapMb,
			maxYoungGenerationSizeMb: Math.max(16, Math.round(limits.parseHeapMb / 8)),
			stackSizeMb: 4
		}
	};
}

/** Start a parser thread and wait until it has loaded; null when it cannot (dev server). */
async function startThread(limits: StencilLimits): Promise<Worker | null> {
	const worker = await startModuleThread({
		moduleUrl: import.meta.url,
		flag: WORKER_FLAG,
		resourceLimits: heapOptions(limits).resourceLimits,
		startTimeoutMs: START_TIMEOUT_MS
	});
	if (!worker) return null;
	worker.on('exit', () => {
		if (spare === worker) spare = null;
	});
	return worker;
}

let warnedInline = false;

/** Whether the last upload ran on a thread (for tests and diagnostics). */
export let lastParseThreaded = false;

/** The heap size a spare thread was started with; a thread with other limits is not reused. */
let spareHeapMb = 0;

/**
 * Parse an uploaded aperture file on a parser thread: the same answer as `parseApertureUpload`,
 * or 413 when the parse runs past `limits.parseDeadlineMs` or out of its `limits.parseHeapMb`
 * heap (the thread is ended; the server and the stored data are untouched).
 * @example await parseApertureUploadOffThread({ fileName: 'top.gbr', text, byteLength }, limits)
 */
export async function parseApertureUploadOffThread(
	input: UploadInput,
	limits: StencilLimits
): Promise<UploadResult> {
	const release = await slot();
	try {
		let worker = spare && spareHeapMb === limits.parseHeapMb ? spare : null;
		if (worker) spare = null;
		else worker = await startThread(limits);
		if (!worker) {
			if (!warnedInline)
				console.warn(
					'stencil parser thread could not start; stencil files are read in the request thread'
				);
			warnedInline = true;
			lastParseThreaded = false;
			return parseApertureUpload(input, limits);
		}
		lastParseThreaded = true;
		const thread = worker;
		thread.ref();
		const file = input.fileName || 'upload';
		const outcome = await new Promise<{ result: UploadResult; reusable: boolean }>((resolve) => {
			const finish = (result: UploadResult, reusable: boolean) => {
				clearTimeout(timer);
				thread.off('message', onMessage);
				thread.off('error', onError);
				thread.off('exit', onExit);
				resolve({ result, reusable });
			};
			const tooMuch = (why: string): UploadResult => ({
				ok: false,
				status: 413,
				error: `${file} could not be read: ${why}; nothing was imported.`,
				errors: [{ file, line: 0, column: null, message: `file, parse: ${why}` }]
			});
			const timer = setTimeout(() => {
				const ms = limits.parseDeadlineMs;
				const limit = ms >= 1000 ? `${Math.round(ms / 100) / 10} s` : `${ms} ms`;
				finish(tooMuch(`reading it took longer than the ${limit} limit`), false);
			}, limits.parseDeadlineMs);
			const onMessage = (m: Reply) => {
				if (m.type === 'result') finish(m.result, true);
				else if (m.type === 'fatal')
					finish(
						{
							ok: false,
							status: 422,
							error: `${file} could not be read (${m.message}); nothing was imported.`,
							errors: [{ file, line: 0, column: null, message: `file, parse: ${m.message}` }]
						},
						true
					);
			};
			const onError = (err: Error & { code?: string }) => {
				const why =
					err.code === 'ERR_WORKER_OUT_OF_MEMORY'
						? `it needs more than the ${limits.parseHeapMb} MB of memory a file may use`
						: `the parser stopped (${err.message})`;
				finish(tooMuch(why), false);
			};
			const onExit = (code: number) =>
				finish(tooMuch(`the parser stopped (exit code ${code})`), false);
			thread.on('message', onMessage);
			thread.on('error', onError);
			thread.on('exit', onExit);
			thread.postMessage({ type: 'parse', input, limits });
		});
		if (outcome.reusable && spare === null) {
			thread.unref();
			spare = thread;
			spareHeapMb = limits.parseHeapMb;
		} else await thread.terminate();
		return outcome.result;
	} finally {
		release();
	}
}

/** Worker side: parse one upload per message and send the result back. */
function runParseThread(): void {
	const port = parentPort;
	if (!port) return;
	port.on('message', (m: { type: string; input: UploadInput; limits: StencilLimits }) => {
		if (m.type !== 'parse') return;
		try {
			port.postMessage({ type: 'result', result: parseApertureUpload(m.input, m.limits) });
		} catch (err) {
			port.postMessage({ type: 'fatal', message: (err as Error).message });
		}
	});
	port.postMessage({ type: 'ready' });
}

if (isModuleThread(WORKER_FLAG)) {
	runParseThread();
}
