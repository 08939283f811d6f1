import { describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ApiError, errorResponse } from './api';
import { DuplicateCodeError } from './factory';
import { PrintlogRequestError } from './printlog/request-error';
import { PrintlogInputError } from '$lib/printlog';
import { BodyTooLargeError } from './request-body';
import { LastAdminError } from './users';

/** errorResponse is the one mapping from a thrown error to the API's JSON answer. */
describe('errorResponse', () => {
	it('answers a refusal with its own status and body', async () => {
		const duplicate = errorResponse(new DuplicateCodeError('line', 'SMT-1'));
		expect(duplicate.status).toBe(409);
		expect(await duplicate.json()).toEqual({
			error: 'A line with the code "SMT-1" already exists.'
		});
		expect(errorResponse(new LastAdminError()).status).toBe(409);
		const tooLarge = errorResponse(new BodyTooLargeError(1024 * 1024));
		expect(tooLarge.status).toBe(413);
		expect((await tooLarge.json()).error).toMatch(/larger than the limit of 1 MB/);
	});
	it('answers print-log refusals with their fields and extra parts', async () => {
		const refused = errorResponse(
			new PrintlogRequestError(
				422,
				[{ field: 'stencil', message: 'is not approved for PB-100' }],
				undefined,
				{ refusals: [{ field: 'stencil', reason: 'stencil-not-approved' }] }
			)
		);
		expect(refused.status).toBe(422);
		expect(await refused.json()).toEqual({
			error: 'stencil: is not approved for PB-100',
			fields: [{ field: 'stencil', message: 'is not approved for PB-100' }],
			refusals: [{ field: 'stencil', reason: 'stencil-not-approved' }]
		});
		const input = errorResponse(new PrintlogInputError([{ field: 'at', message: 'not a time' }]));
		expect(input.status).toBe(422);
		expect((await input.json()).fields).toEqual([{ field: 'at', message: 'not a time' }]);
	});
	it('keeps the body an ApiError was given', async () => {
		const answer = errorResponse(new ApiError(404, { error: 'No such stencil.' }));
		expect(answer.status).toBe(404);
		expect(await answer.json()).toEqual({ error: 'No such stencil.' });
	});
	it('answers invalid fields 400 naming each field', async () => {
		const parsed = z.object({ code: z.string().min(1) }).safeParse({ code: '' });
		expect(parsed.success).toBe(false);
		const answer = errorResponse(parsed.error);
		expect(answer.status).toBe(400);
		expect((await answer.json()).fields[0].field).toBe('code');
	});
	it('answers anything else 500 without details, and logs it', async () => {
		const log = vi.spyOn(console, 'error').mockImplementation(() => {});
		const answer = errorResponse(new TypeError('secret internals'));
		expect(answer.status).toBe(500);
		expect(JSON.stringify(await answer.json())).not.toContain('secret');
		expect(log).toHaveBeenCalled();
		log.mockRestore();
	});
});
