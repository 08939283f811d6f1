import { describe, expect, it } from 'vitest';
import type { IngestRequest } from './ingest-types';
import { readProgress } from './progress';
import { reportDone, reportRunning } from './stage-report';

const request = (job: string | null, totalBytes: number | null = null): IngestRequest => ({
	source: 'upload',
	fileName: 'a.csv',
	body: [] as unknown as AsyncIterable<Uint8Array>,
	createdBy: 'user:1',
	job,
	totalBytes
});

describe('stage-report', () => {
	it('reports a running import under its job key, with the declared size', () => {
		reportRunning(request('job-run-0001', 1000), 'receiving', { sizeBytes: 400, rows: 12 }, 2);
		expect(readProgress('job-run-0001')).toMatchObject({
			phase: 'receiving',
			fileName: 'a.csv',
			bytes: 400,
			totalBytes: 1000,
			rows: 12,
			boards: 2
		});
	});

	it('reports the verdict; the received size stands in for an unknown declared one', () => {
		reportDone(request('job-done-0001'), { sizeBytes: 900, rows: 30 }, 7, 'rejected');
		expect(readProgress('job-done-0001')).toMatchObject({
			phase: 'done',
			bytes: 900,
			totalBytes: 900,
			importId: 7,
			status: 'rejected'
		});
	});

	it('reports nothing without a job key', () => {
		reportDone(request(null), { sizeBytes: 1, rows: 1 }, 1, 'imported');
		expect(readProgress('null')).toBeUndefined();
	});
});
