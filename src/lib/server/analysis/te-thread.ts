import Database from 'better-sqlite3';
import { drizzle } from 'drizzle-orm/better-sqlite3';
import { parentPort, type Worker } from 'node:worker_threads';
import { isModuleThread, startModuleThread } from '../module-thread';
import type { Db } from '../db';
import * as schema from '../db/schema';
import { transferEfficiency, type TeAnswer, type TeFilters } from './transfer-efficiency';

/**
 * The transfer-efficiency scan (up to 2,000,000 pad rows, 0.4–1 s) on a worker thread with its
 * own read-only connection to the same database file, so the request thread stays free: in the
 * request thread the scan's slices held every other request up to 0.44 s each.
 *
 * As in `../stencils/parse-thread.ts`, the worker runs this very module (its own
 * `import.meta.url`: the built chunk in production, the TypeScript file through tsx's loader
 * under vitest and the benchmarks); where no thread can start (Vite's dev server) or the
 * database is in memory, the scan runs in this thread as before.
 */

const WORKER_FLAG = 'rollbeadTeScan';

/** Scans at once: each keeps a core busy, and the machine has few; more requests wait. */
const MAX_THREADS = 1;

/** How long a new thread may take to load its module before the scan runs inline. */
const START_TIMEOUT_MS = 15_000;

/** The scan thread's heap ceiling, MB: the scan keeps a few thousand aggregate rows. */
const HEAP_MB = 256;

type Reply =
	| { type: 'ready' }
	| { type: 'result'; id: number; answer: TeAnswer }
	| { type: 'fatal'; id: number; message: string; status?: number };

let thread: Worker | null = null;
let starting: Promise<Worker | null> | null = null;
let running = 0;
const queue: (() => void)[] = [];
let nextId = 0;
let warnedInline = false;

/** Whether the last scan ran on the worker thread (tests and diagnostics). */
export let lastScanThreaded = false;

async function slot(): Promise<() => void> {
	if (running >= MAX_THREADS) await new Promise<void>((resolve) => queue.push(resolve));
	running++;
	return () => {
		running--;
		queue.shift()?.();
	};
}

async function startThread(): Promise<Worker | null> {
	const worker = await startModuleThread({
		moduleUrl: import.meta.url,
		flag: WORKER_FLAG,
		resourceLimits: { maxOldGenerationSizeMb: HEAP_MB },
		startTimeoutMs: START_TIMEOUT_MS
	});
	if (!worker) return null;
	worker.on('exit', () => {
		if (thread === worker) thread = null;
	});
	// An idle scan thread does not keep the process alive.
	worker.unref();
	return worker;
}

/** The one scan thread, started on first use (null when it cannot start). */
async function scanThread(): Promise<Worker | null> {
	if (thread) return thread;
	starting ??= startThread().then((w) => {
		thread = w;
		starting = null;
		return w;
	});
	return starting;
}

/**
 * `transferEfficiency` on the scan thread: the same answer, with the request thread free.
 * @example await transferEfficiencyOffThread(getDb(), readTeFilters(url))
 */
export async function transferEfficiencyOffThread(db: Db, filters: TeFilters): Promise<TeAnswer> {
	const file = db.$client.name;
	if (!file || file === ':memory:' || db.$client.memory) return inline(db, filters);
	const release = await slot();
	try {
		const worker = await scanThread();
		if (!worker) {
			if (!warnedInline)
				console.warn(
					'transfer-efficiency thread could not start; the scan runs in the request thread'
				);
			warnedInline = true;
			return inline(db, filters);
		}
		lastScanThreaded = true;
		const id = ++nextId;
		worker.ref();
		try {
			return await new Promise<TeAnswer>((resolve, reject) => {
				const done = () => {
					worker.off('message', onMessage);
					worker.off('error', onError);
					worker.off('exit', onExit);
				};
				const onMessage = (m: Reply) => {
					if (m.type === 'result' && m.id === id) {
						done();
						resolve(m.answer);
					} else if (m.type === 'fatal' && m.id === id) {
						done();
						reject(new Error(`transfer-efficiency scan failed: ${m.message}`));
					}
				};
				const onError = (err: Error) => {
					done();
					reject(new Error(`transfer-efficiency scan stopped: ${err.message}`));
				};
				const onExit = (code: number) => {
					done();
					reject(new Error(`transfer-efficiency scan stopped (exit code ${code})`));
				};
				worker.on('message', onMessage);
				worker.on('error', onError);
				worker.on('exit', onExit);
				worker.postMessage({ type: 'scan', id, file, filters });
			});
		} finally {
			worker.unref();
		}
	} finally {
		release();
	}
}

function inline(db: Db, filters: TeFilters): Promise<TeAnswer> {
	lastScanThreaded = false;
	return transferEfficiency(db, filters);
}

/** Worker side: one read-only connection per database file, one scan per message. */
function runScanThread(): void {
	const port = parentPort;
	if (!port) return;
	const connections = new Map<string, Db>();
	const dbOf = (file: string): Db => {
		let db = connections.get(file);
		if (!db) {
			const sqlite = new Database(file, { readonly: true, fileMustExist: true });
			sqlite.pragma('busy_timeout = 750');
			db = drizzle(sqlite, { schema }) as Db;
			connections.set(file, db);
		}
		return db;
	};
	port.on('message', (m: { type: string; id: number; file: string; filters: TeFilters }) => {
		if (m.type !== 'scan') return;
		// The same slices as in the request thread: they keep the temporary board table small.
		transferEfficiency(dbOf(m.file), m.filters).then(
			(answer) => port.postMessage({ type: 'result', id: m.id, answer }),
			(err: Error) => port.postMessage({ type: 'fatal', id: m.id, message: err.message })
		);
	});
	port.postMessage({ type: 'ready' });
}

if (isModuleThread(WORKER_FLAG)) {
	runScanThread();
}
