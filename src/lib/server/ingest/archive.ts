import { closeSync, mkdirSync, openSync, renameSync, rmSync, existsSync, writeSync } from 'node:fs';
import { createHash, randomBytes } from 'node:crypto';
import { dirname, join, relative } from 'node:path';

/**
 * Content-addressed archive of imported originals: `<db folder>/archive/<sha[0,2]>/<sha256>`.
 * A file is first written to `archive/tmp/` while it streams in, then renamed to its hash
 * (rename within one folder tree is atomic), so a killed server leaves at most a temp file,
 * which `cleanArchiveTemp` removes at start-up.
 */

/** The archive folder beside the database file. */
export function archiveDir(databaseFile: string): string {
	return join(dirname(databaseFile), 'archive');
}

/**
 * A file being written to the archive's temp folder. This side opens and closes the temp file
 * and moves or deletes it at the end; the bytes are written through `openArchiveSink` by
 * whichever thread reads the file (file descriptors are shared by all threads of the process).
 */
export interface ArchiveWriter {
	/** File descriptor of the open temp file, for `openArchiveSink`. */
	readonly fd: number;
	/** Move the temp file to its content address; returns the path relative to the db folder. */
	commit(sha256: string): string;
	/** Delete the temp file (duplicates, failures). */
	discard(): void;
}

/** Start writing a new original into the archive of the database at `databaseFile`. */
export function openArchiveWriter(databaseFile: string): ArchiveWriter {
	const root = archiveDir(databaseFile);
	const tmpDir = join(root, 'tmp');
	mkdirSync(tmpDir, { recursive: true });
	const tmpPath = join(tmpDir, `${Date.now()}-${randomBytes(6).toString('hex')}.part`);
	// Readable too: when the parser thread stops mid-file, the hash is taken from the file itself.
	const fd = openSync(tmpPath, 'w+');
	let open = true;
	const close = () => {
		if (open) closeSync(fd);
		open = false;
	};
	return {
		fd,
		commit(sha256) {
			close();
			const dir = join(root, sha256.slice(0, 2));
			mkdirSync(dir, { recursive: true });
			const target = join(dir, sha256);
			if (existsSync(target)) rmSync(tmpPath, { force: true });
			else renameSync(tmpPath, target);
			return relative(dirname(databaseFile), target);
		},
		discard() {
			close();
			rmSync(tmpPath, { force: true });
		}
	};
}

/** Writes a file's bytes to an archive temp file and hashes them on the way. */
export interface ArchiveSink {
	write(chunk: Uint8Array): void;
	/** Lower-case hex SHA-256 of everything written (call once, at the end). */
	digest(): string;
}

/** A sink onto the open temp file `fd` of an `ArchiveWriter` (usable on any thread). */
export function openArchiveSink(fd: number): ArchiveSink {
	const hash = createHash('sha256');
	return {
		write(chunk) {
			hash.update(chunk);
			let off = 0;
			while (off < chunk.length) off += writeSync(fd, chunk, off, chunk.length - off);
		},
		digest: () => hash.digest('hex')
	};
}

/** Remove temp files left by a server that stopped in the middle of an import. */
export function cleanArchiveTemp(databaseFile: string): void {
	rmSync(join(archiveDir(databaseFile), 'tmp'), { recursive: true, force: true });
}
