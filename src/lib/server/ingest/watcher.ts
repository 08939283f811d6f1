import { watch, type FSWatcher } from 'chokidar';
import {
	createReadStream,
	existsSync,
	mkdirSync,
	renameSync,
	statSync,
	writeFileSync
} from 'node:fs';
import { basename, dirname, extname, join, resolve } from 'node:path';
import { formatIngestIssue } from '$lib/ingest';
import type { Db } from '../db';
import { ingestSpiFile, type IngestOutcome } from './ingest-service';
import { resolveImportProfile } from './profiles';

/** A running folder watcher. */
export interface SpiFolderWatcher {
	/** Resolves once the initial scan is done (files already there are queued). */
	ready: Promise<void>;
	/** Resolves when every queued file has been handled (tests). */
	idle(): Promise<void>;
	close(): Promise<void>;
}

/** Options of `startSpiWatcher`. */
export interface SpiWatcherOptions {
	dir: string;
	/** Profile id or name for every file (SPI_WATCH_PROFILE); default the canonical layout. */
	profile?: string | null;
	/** How long a file's size must stay the same before it is read (ms, default 2000). */
	stableMs?: number;
	log?: (message: string) => void;
}

/** A free name in `dir` for `name` (adds `-1`, `-2`, … before the extension when taken). */
function freeName(dir: string, name: string): string {
	const ext = extname(name);
	const stem = name.slice(0, name.length - ext.length);
	let candidate = name;
	for (let n = 1; existsSync(join(dir, candidate)); n++) candidate = `${stem}-${n}${ext}`;
	return join(dir, candidate);
}

/** The text report written beside a rejected (or duplicate) file. */
function reportText(file: string, outcome: IngestOutcome): string {
	if (outcome.status === 'duplicate')
		return `${file}: same content as SPI import ${outcome.id}; not imported again.\n`;
	if (outcome.status === 'rejected')
		return [
			`${file}: rejected (import ${outcome.id}); nothing of it was stored.`,
			`${outcome.errorCount} error(s); the first ${outcome.errors.length}:`,
			...outcome.errors.map(formatIngestIssue),
			''
		].join('\n');
	return `${file}: imported as SPI import ${outcome.id}.\n`;
}

/**
 * Watch a folder for SPI exports: each new top-level file is ingested once its size has been
 * stable for `stableMs`, through the same service as uploads, then moved to `done/` (imported or
 * duplicate) or `rejected/` with `<name>.errors.txt` beside it. Restarts neither skip nor repeat:
 * files still in the folder at start are read again, and a file that was imported but not yet
 * moved (server stopped in between) is recognised by its SHA-256 as a duplicate and moved.
 * Dot files and `*.part`/`*.tmp` files are ignored (write exports under such a name and rename).
 * @example const w = startSpiWatcher(getDb(), { dir: '/srv/spi' }); await w.close();
 */
export function startSpiWatcher(db: Db, options: SpiWatcherOptions): SpiFolderWatcher {
	const dir = resolve(options.dir);
	const doneDir = join(dir, 'done');
	const rejectedDir = join(dir, 'rejected');
	mkdirSync(doneDir, { recursive: true });
	mkdirSync(rejectedDir, { recursive: true });
	const log = options.log ?? ((m: string) => console.log(`[rollbead] ${m}`));
	const queued = new Set<string>();
	let chain: Promise<void> = Promise.resolve();

	async function handle(path: string): Promise<void> {
		if (!existsSync(path)) return;
		const name = basename(path);
		let outcome: IngestOutcome;
		try {
			const { profile, profileId } = resolveImportProfile(db, options.profile);
			outcome = await ingestSpiFile(db, {
				source: 'watch',
				fileName: name,
				body: createReadStream(path, { highWaterMark: 1 << 20 }),
				profile,
				profileId,
				createdBy: 'system',
				sourcePath: path,
				totalBytes: statSync(path).size
			});
		} catch (err) {
			// A server fault (not the file's content): leave the file for the next start.
			log(`watched file ${path} not imported: ${(err as Error).message}`);
			return;
		}
		const target = outcome.status === 'rejected' ? rejectedDir : doneDir;
		const moved = freeName(target, name);
		renameSync(path, moved);
		if (outcome.status !== 'imported')
			writeFileSync(`${moved}.errors.txt`, reportText(name, outcome));
		log(`watched file ${name}: ${outcome.status} (import ${outcome.id}) → ${moved}`);
	}

	function enqueue(path: string): void {
		if (dirname(resolve(path)) !== dir || queued.has(path)) return;
		queued.add(path);
		chain = chain.then(() => handle(path)).finally(() => queued.delete(path));
	}

	const watcher: FSWatcher = watch(dir, {
		depth: 0,
		ignoreInitial: false,
		awaitWriteFinish: { stabilityThreshold: options.stableMs ?? 2000, pollInterval: 100 },
		ignored: (path, stats) => {
			const name = basename(path);
			if (resolve(path) === dir) return false;
			if (name.startsWith('.') || /\.(part|tmp)$/i.test(name)) return true;
			return stats !== undefined && !stats.isFile();
		}
	});
	watcher.on('add', enqueue);
	watcher.on('error', (err) => log(`SPI watcher error: ${(err as Error).message}`));
	const ready = new Promise<void>((r) => watcher.once('ready', () => r()));
	return {
		ready,
		idle: async () => {
			let seen: Promise<void>;
			do {
				seen = chain;
				await seen;
			} while (seen !== chain);
		},
		close: async () => {
			await watcher.close();
			await chain;
		}
	};
}
