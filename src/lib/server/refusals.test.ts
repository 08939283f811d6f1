import { isActionFailure, isHttpError } from '@sveltejs/kit';
import { describe, expect, it } from 'vitest';
import { LimitsError } from '$lib/spc';
import { NotFoundError } from './spc/chart-service';
import { refusalToError, refusalToFail } from './refusals';

describe('refusalToFail', () => {
	it('turns a refusal into fail(status) with its first field and message', () => {
		const out = refusalToFail(new LimitsError('reason', 'Say why.'), { action: 'exclude' });
		expect(isActionFailure(out)).toBe(true);
		expect(out.status).toBe(422);
		expect(out.data).toEqual({ action: 'exclude', field: 'reason', error: 'Say why.' });
	});
	it('rethrows anything that is not a refusal', () => {
		const defect = new TypeError('boom');
		expect(() => refusalToFail(defect, {})).toThrow(defect);
	});
});

describe('refusalToError', () => {
	it('turns a refusal into an HTTP error with its status and message', () => {
		let thrown: unknown;
		try {
			refusalToError(new NotFoundError('No chart with id 9.'));
		} catch (err) {
			thrown = err;
		}
		expect(isHttpError(thrown, 404)).toBe(true);
		expect((thrown as { body: { message: string } }).body.message).toBe('No chart with id 9.');
	});
	it('rethrows anything that is not a refusal', () => {
		const defect = new RangeError('bad');
		expect(() => refusalToError(defect)).toThrow(defect);
	});
});
