/**
 * In-memory progress of running imports, keyed by a job key the client chooses (the upload
 * page sends `x-import-job`), so the page can poll the server's work while it uploads. Kept in
 * memory on purpose: a running import leaves no trace in the database until it commits.
 */

/** What a running or finished import has done so far. */
export interface ImportProgress {
	job: string;
	phase: 'receiving' | 'finishing' | 'done';
	fileName: string;
	bytes: number;
	/** Declared size (content-length) when known. */
	totalBytes: number | null;
	rows: number;
	boards: number;
	/** Set when done: the import id and its verdict. */
	importId?: number;
	status?: string;
	updatedAt: number;
}

const jobs = new Map<string, ImportProgress>();
const KEEP_MS = 10 * 60 * 1000;
const JOB_KEY = /^[A-Za-z0-9_-]{8,64}$/;

/** Whether a client-sent job key is acceptable (8–64 of A–Z a–z 0–9 _ -). */
export function isJobKey(value: string | null | undefined): value is string {
	return typeof value === 'string' && JOB_KEY.test(value);
}

/** Record or update a job's progress (old finished jobs are dropped on the way). */
export function reportProgress(p: Omit<ImportProgress, 'updatedAt'>): void {
	const now = Date.now();
	jobs.set(p.job, { ...p, updatedAt: now });
	if (jobs.size > 200) {
		for (const [k, v] of jobs) if (now - v.updatedAt > KEEP_MS) jobs.delete(k);
	}
}

/** A job's progress, or undefined when unknown (never started or long finished). */
export function readProgress(job: string): ImportProgress | undefined {
	return jobs.get(job);
}
