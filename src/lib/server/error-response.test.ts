import { describe, expect, it, vi } from 'vitest';
import { z } from 'zod';
import { ApiError, errorResponse } from './api';
import { Refusal } from '$lib/errors';
import { CfxInputError } from './cfx/store';
import { OeeRequestError } from './cfx/oee';
import { DuplicateCodeError } from './factory';
import { PrintlogRequestError } from './printlog/request-error';
import { PrintlogInputError } from '$lib/printlog';
import { BodyTooLargeError } from './request-body';
import { LastAdminError } from './users';
import { SpcInputError, LimitsError } from '$lib/spc';
import { StencilInputError } from '$lib/stencil';
import { StencilBudgetError } from '$lib/stencil/limits';
import { AcknowledgeError } from './spc/signals';
import { NotFoundError } from './spc/chart-service';
import { AssignError } from './floor/signal-owners';
import { ApertureImportError, DuplicateStencilError, StencilNotFoundError } from './stencils';

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
	it('answers SPC refusals 404 / 422 naming the field', async () => {
		const input = errorResponse(new SpcInputError('lsl', 'LSL 5 must be below USL 4'));
		expect(input.status).toBe(422);
		expect(await input.json()).toEqual({
			error: 'lsl: LSL 5 must be below USL 4',
			fields: [{ field: 'lsl', message: 'LSL 5 must be below USL 4' }]
		});
		const limits = errorResponse(new LimitsError('reason', 'Say why.'));
		expect(limits.status).toBe(422);
		expect((await limits.json()).fields).toEqual([{ field: 'reason', message: 'Say why.' }]);
		const missing = errorResponse(new NotFoundError('No chart with id 9.'));
		expect(missing.status).toBe(404);
		expect(await missing.json()).toEqual({ error: 'No chart with id 9.' });
	});
	it('answers signal refusals 422 as `{ errors }` (their API contract), others `{ error }`', async () => {
		const ack = errorResponse(new AcknowledgeError(422, 'not a listed cause', 'cause'));
		expect(ack.status).toBe(422);
		expect(await ack.json()).toEqual({
			errors: [{ field: 'cause', message: 'not a listed cause' }]
		});
		const done = errorResponse(new AcknowledgeError(409, 'Signal 3 is acknowledged already.'));
		expect(done.status).toBe(409);
		expect(await done.json()).toEqual({ error: 'Signal 3 is acknowledged already.' });
		const assign = errorResponse(new AssignError(422, 'No person with id 9.'));
		expect(await assign.json()).toEqual({
			errors: [{ field: 'userId', message: 'No person with id 9.' }]
		});
		expect(errorResponse(new AssignError(404, 'No signal with id 9.')).status).toBe(404);
	});
	it('answers stencil refusals in the stencil API shapes', async () => {
		const missing = errorResponse(new StencilNotFoundError(7));
		expect(missing.status).toBe(404);
		expect(await missing.json()).toEqual({ error: 'No stencil with id 7.' });
		expect(errorResponse(new DuplicateStencilError('ST-1', 'A')).status).toBe(409);
		const problem = { where: 'U1.3', field: 'widthUm', message: 'must be greater than 0' };
		const refused = errorResponse(new ApertureImportError([problem]));
		expect(refused.status).toBe(422);
		expect(await refused.json()).toEqual({
			error: 'The apertures were refused; nothing was imported.',
			errors: [{ ...problem, message: 'U1.3, widthUm: must be greater than 0' }]
		});
		const invalid = errorResponse(new StencilInputError([problem]));
		expect(invalid.status).toBe(400);
		expect(await invalid.json()).toEqual({
			error: 'U1.3, widthUm: must be greater than 0',
			fields: [{ field: 'widthUm', message: 'U1.3, widthUm: must be greater than 0' }]
		});
		const budget = errorResponse(new StencilBudgetError('too many vertices', 413));
		expect(budget.status).toBe(413);
		expect(await budget.json()).toEqual({ error: 'too many vertices' });
	});
	it('answers machine-message refusals naming the field', async () => {
		const held = errorResponse(new CfxInputError(409, 'id', 'message #4 is already stored'));
		expect(held.status).toBe(409);
		expect(await held.json()).toEqual({
			error: 'message #4 is already stored',
			fields: [{ field: 'id', message: 'message #4 is already stored' }]
		});
		const oee = errorResponse(new OeeRequestError('too many boards in one shift'));
		expect(oee.status).toBe(422);
		expect(await oee.json()).toEqual({ error: 'too many boards in one shift' });
	});
	it('keeps the body an ApiError was given', async () => {
		const answer = errorResponse(new ApiError(404, { error: 'No such stencil.' }));
		expect(answer.status).toBe(404);
		expect(await answer.json()).toEqual({ error: 'No such stencil.' });
		const invalid = new ApiError(400, {
			error: 'The request has invalid fields.',
			fields: [{ field: 'layout', message: 'must be "rows" or "columns"' }]
		});
		expect(invalid).toBeInstanceOf(Refusal);
		expect(invalid.message).toBe('The request has invalid fields.');
		expect(invalid.fieldProblems).toEqual([
			{ field: 'layout', message: 'must be "rows" or "columns"' }
		]);
		expect(await errorResponse(invalid).json()).toEqual(invalid.body());
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
