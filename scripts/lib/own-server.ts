/**
 * A Rollbead server of one's own, for the benchmarks and for e2e specs that stop, kill, load or
 * configure a server: built when sources changed (under the shared e2e lock), started through
 * `server.js` (the entry `npm start` and the Playwright web server use) on its own port and
 * database, with API tokens made by the real command-line tool. Only node's own modules here, so
 * playwright.config.ts can import it too.
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { once } from 'node:events';
import { createServer } from 'node:net';
import { join, resolve } from 'node:path';
import type { Role } from '../../src/lib/access';

export const ROOT = resolve(import.meta.dirname, '../..');
/** Rollbead's server entry: adapter-node's server with the headers every answer carries. */
export const SERVER_ENTRY = join(ROOT, 'server.js');
/** Held while building and while a spec or benchmark reads the build (rules in DEVELOPERS.md). */
export const E2E_LOCK = '/tmp/rollbead-e2e.lock';

export async function freePort(): Promise<number> {
	return new Promise((resolve, reject) => {
		const server = createServer();
		server.unref();
		server.on('error', reject);
		server.listen(0, '127.0.0.1', () => {
			const address = server.address();
			server.close(() => resolve(typeof address === 'object' && address ? address.port : 0));
		});
	});
}

/**
 * Build when sources changed, under the e2e lock; with `copyTo`, also copy the build there while
 * still holding the lock, so another build cannot change it underneath a long run.
 */
export function ensureBuild(copyTo?: string): void {
	const copy = copyTo ? ` && cp -r build "${copyTo}"` : '';
	execFileSync('flock', [E2E_LOCK, 'sh', '-c', `node scripts/ensure-build.js${copy}`], {
		cwd: ROOT,
		stdio: 'inherit'
	});
}

/** The e2e lock, held by a child process until `release()` or until this process ends. */
export interface HeldBuild {
	release(): void;
}

/**
 * Build when sources changed and keep holding the e2e lock, so a server run on the shared build/
 * for a long time is not rebuilt underneath. The holder waits on its stdin: when this process
 * ends, however it ends, the pipe closes and the lock is freed. Rejects with `buildFailed` set
 * when the build failed (another helper mid-edit: worth trying again later).
 */
export async function buildAndHoldLock(): Promise<HeldBuild> {
	const holder = spawn(
		'flock',
		[E2E_LOCK, 'sh', '-c', 'node scripts/ensure-build.js >&2 || exit 3; echo held; exec cat'],
		{ cwd: ROOT, stdio: ['pipe', 'pipe', 'inherit'] }
	);
	holder.stdout?.resume();
	await new Promise<void>((resolveHeld, reject) => {
		holder.stdout?.once('data', () => resolveHeld());
		holder.once('exit', (code) =>
			reject(
				Object.assign(new Error(`building under the e2e lock failed (exit ${code})`), {
					buildFailed: code === 3
				})
			)
		);
	});
	holder.unref();
	return { release: () => holder.stdin?.end() };
}

export interface OwnServer {
	url: string;
	child: ChildProcess;
	/** Everything the server printed. */
	output(): string;
	/** SIGTERM (the way an operator stops it, so shutdown code and CPU profiles run), wait for the exit; SIGKILL after 15 s. */
	stop(): Promise<void>;
}

export async function startServer(options: {
	databaseFile: string;
	port: number;
	demo: boolean;
	/** Overrides of the defaults below (ORIGIN, SPI_WATCH_DIR, …) and further settings. */
	env?: Record<string, string>;
	/** Another build folder (a copy, an older commit's); default: the repo's build/. */
	buildFolder?: string;
	/** Options for node itself, e.g. `--cpu-prof`. */
	nodeArgs?: string[];
}): Promise<OwnServer> {
	const url = `http://127.0.0.1:${options.port}`;
	const entry = [SERVER_ENTRY, ...(options.buildFolder ? [options.buildFolder] : [])];
	const child = spawn(process.execPath, [...(options.nodeArgs ?? []), ...entry], {
		cwd: ROOT,
		env: {
			...process.env,
			NODE_OPTIONS: '',
			PORT: String(options.port),
			HOST: '127.0.0.1',
			ORIGIN: url,
			DATABASE_URL: options.databaseFile,
			ROLLBEAD_DEMO: options.demo ? '1' : '0',
			SPI_WATCH_DIR: '',
			...options.env
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let output = '';
	child.stdout?.on('data', (c) => (output += c));
	child.stderr?.on('data', (c) => (output += c));
	const exited = once(child, 'exit');
	// Never leave a server running when the caller's process ends, however it ends.
	const killNow = () => {
		if (child.exitCode === null && child.signalCode === null) child.kill('SIGKILL');
	};
	process.once('exit', killNow);
	const stop = async () => {
		process.off('exit', killNow);
		if (child.exitCode !== null || child.signalCode !== null) return;
		child.kill('SIGTERM');
		const timer = setTimeout(killNow, 15_000);
		await exited;
		clearTimeout(timer);
	};
	const deadline = Date.now() + 120_000;
	for (;;) {
		if (child.exitCode !== null) {
			process.off('exit', killNow);
			throw new Error(`server exited ${child.exitCode}:\n${output}`);
		}
		try {
			const res = await fetch(`${url}/api/health`);
			if (res.ok) break;
		} catch {
			// not listening yet
		}
		if (Date.now() > deadline) {
			await stop();
			throw new Error(`server did not start:\n${output}`);
		}
		await new Promise((r) => setTimeout(r, 200));
	}
	return { url, child, output: () => output, stop };
}

/** An API token made by the command-line tool against `databaseFile` (it migrates the file). */
export function makeTokenIn(databaseFile: string, role: Role, name = `e2e ${role}`): string {
	const output = execFileSync(
		process.execPath,
		['--import', 'tsx', 'scripts/token.ts', 'create', '--name', name, '--role', role],
		{ cwd: ROOT, env: { ...process.env, DATABASE_URL: databaseFile }, encoding: 'utf8' }
	);
	const lines = output.trim().split('\n');
	return lines[lines.length - 1];
}
