import { isMainThread, Worker, workerData, type ResourceLimits } from 'node:worker_threads';

/**
 * Threads that run a module of Rollbead's own (the SPI parser, the stencil parser, the
 * transfer-efficiency scan). The module starts a thread of itself: the thread loads the same
 * file, sees its flag in `workerData` and answers `{ type: 'ready' }` once it listens.
 */

/** Is this code running on a thread started for `flag` (the module's worker side)? */
export function isModuleThread(flag: string): boolean {
	return !isMainThread && (workerData as Record<string, unknown> | null)?.[flag] === true;
}

/**
 * Start a thread of the module at `moduleUrl` (pass `import.meta.url`) and wait until it says it
 * is ready. Null when it cannot start or is not ready within `startTimeoutMs` (then the caller
 * runs the work inline). `resourceLimits` make a runaway input end its thread, not the server.
 */
export async function startModuleThread(options: {
	moduleUrl: string;
	flag: string;
	resourceLimits: ResourceLimits;
	startTimeoutMs: number;
}): Promise<Worker | null> {
	const { moduleUrl, flag, resourceLimits, startTimeoutMs } = options;
	let worker: Worker;
	try {
		const data = { workerData: { [flag]: true }, resourceLimits };
		// From TypeScript sources (tsx, vitest) the thread loads the module through tsx's loader,
		// which a worker does not inherit; the built app runs its own .js chunk directly.
		worker = moduleUrl.endsWith('.ts')
			? new Worker(
					`import('tsx/esm/api').then((m) => { m.register(); return import(${JSON.stringify(moduleUrl)}); });`,
					{ ...data, eval: true }
				)
			: new Worker(new URL(moduleUrl), data);
	} catch {
		return null;
	}
	const started = await new Promise<boolean>((resolve) => {
		const timer = setTimeout(() => resolve(false), startTimeoutMs);
		worker.once('message', (m: { type?: unknown }) => {
			clearTimeout(timer);
			resolve(m?.type === 'ready');
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
	// Errors after start arrive as the caller's task failures (exit codes, messages).
	worker.on('error', () => undefined);
	return worker;
}
