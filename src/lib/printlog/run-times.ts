/**
 * Print run times: a run starts, and ends when the technician closes it. One printer (line)
 * runs one job at a time, so a second open run on the same line is refused.
 */
import type { FieldError } from './field-error';
import { PrintlogInputError } from './field-error';
import type { Instant } from './to-epoch-ms';
import { toEpochMs } from './to-epoch-ms';

/** The times of a run; `endedAt` null or absent while the run is open. */
export interface RunTimes {
	startedAt: Instant;
	endedAt?: Instant | null;
}

/** A run as needed for the overlap check. */
export interface RunOnLine extends RunTimes {
	id: string | number;
	line: string;
	product?: string;
}

/**
 * Validate a run's start and end: both readable, end not before start (an end equal to the
 * start is allowed: a run closed straight away).
 * @example validateRunTimes({ startedAt: '2026-03-02T08:00:00Z', endedAt: '2026-03-02T07:00:00Z' })
 * // [{ field: 'endedAt', message: 'must not be before startedAt (2026-03-02T08:00:00.000Z)' }]
 */
export function validateRunTimes(run: RunTimes): FieldError[] {
	const errors: FieldError[] = [];
	let startMs: number | null = null;
	let endMs: number | null = null;
	try {
		startMs = toEpochMs(run.startedAt, 'startedAt');
	} catch (error) {
		errors.push(...(error as PrintlogInputError).errors);
	}
	if (run.endedAt !== undefined && run.endedAt !== null) {
		try {
			endMs = toEpochMs(run.endedAt, 'endedAt');
		} catch (error) {
			errors.push(...(error as PrintlogInputError).errors);
		}
	}
	if (startMs !== null && endMs !== null && endMs < startMs) {
		const start = new Date(startMs).toISOString();
		errors.push({ field: 'endedAt', message: `must not be before startedAt (${start})` });
	}
	return errors;
}

/** Line codes compare trimmed and case-insensitive ('L1' = ' l1 '). */
function sameLine(a: string, b: string): boolean {
	return a.trim().toLowerCase() === b.trim().toLowerCase();
}

/**
 * Find a run still open on the line, so a new run there can be refused with a message naming
 * it. `excludeId` skips the run being edited.
 * @example
 * findOverlappingOpenRun([{ id: 7, line: 'L1', product: 'BRD-100', startedAt: '2026-03-02T06:00:00Z' }], 'L1')
 * // { run: { id: 7, … }, message: 'line L1 already has an open run: run 7 (BRD-100), started 2026-03-02T06:00:00.000Z; close it first' }
 */
export function findOverlappingOpenRun<R extends RunOnLine>(
	runs: readonly R[],
	line: string,
	excludeId?: string | number
): { run: R; message: string } | null {
	const open = runs.find(
		(run) =>
			sameLine(run.line, line) &&
			(run.endedAt === null || run.endedAt === undefined) &&
			run.id !== excludeId
	);
	if (!open) return null;
	let started: string;
	try {
		started = new Date(toEpochMs(open.startedAt, 'startedAt')).toISOString();
	} catch {
		started = String(open.startedAt);
	}
	const product = open.product ? ` (${open.product})` : '';
	return {
		run: open,
		message:
			`line ${line.trim()} already has an open run: run ${open.id}${product}, ` +
			`started ${started}; close it first`
	};
}
