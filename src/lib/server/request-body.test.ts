import { describe, expect, it } from 'vitest';
import {
	bodyLimitKind,
	boundRequestBody,
	BodyTooLargeError,
	readBoundedBody
} from './request-body';

function streamOf(chunks: number[], onCancel?: () => void): ReadableStream<Uint8Array> {
	let i = 0;
	return new ReadableStream<Uint8Array>({
		pull(controller) {
			if (i < chunks.length) controller.enqueue(new Uint8Array(chunks[i++]).fill(65));
			else controller.close();
		},
		cancel: onCancel
	});
}

describe('readBoundedBody', () => {
	it('joins the chunks of a body within the limit', async () => {
		const bytes = await readBoundedBody(streamOf([3, 4, 5]), 12);
		expect(bytes.byteLength).toBe(12);
		expect(new TextDecoder().decode(bytes)).toBe('A'.repeat(12));
	});

	it('stops at the first chunk past the limit, whatever the stream offers', async () => {
		let pulled = 0;
		const endless = new ReadableStream<Uint8Array>({
			pull(controller) {
				pulled++;
				controller.enqueue(new Uint8Array(1024));
			}
		});
		await expect(readBoundedBody(endless, 10 * 1024)).rejects.toBeInstanceOf(BodyTooLargeError);
		// 11 chunks read to pass the limit (plus the stream's own read-ahead), not the endless rest.
		expect(pulled).toBeLessThan(20);
	});
});

describe('bodyLimitKind', () => {
	it('streams only the SPI upload, gives stencil files and studies the file limit', () => {
		expect(bodyLimitKind('/api/spi/imports')).toBe('stream');
		expect(bodyLimitKind('/api/stencils/[id=id]/apertures')).toBe('file');
		expect(bodyLimitKind('/api/spc/analyze')).toBe('file');
		expect(bodyLimitKind('/api/lines')).toBe('small');
		expect(bodyLimitKind(null)).toBe('small');
	});
});

describe('boundRequestBody', () => {
	it('refuses a declared length over the limit without reading', async () => {
		const request = new Request('http://x/api/lines', {
			method: 'POST',
			headers: { 'content-length': String(2 * 1024 * 1024) },
			body: 'x'
		});
		const answer = await boundRequestBody(request, '/api/lines', true);
		expect(answer).toBeInstanceOf(Response);
		expect((answer as Response).status).toBe(413);
		expect(await (answer as Response).json()).toEqual({
			error: 'The request body is larger than the limit of 1 MB for this route.'
		});
	});

	it('hands the route an equal request whose body is already read', async () => {
		const request = new Request('http://x/api/lines', {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: '{"code":"L1"}'
		});
		const bounded = await boundRequestBody(request, '/api/lines', true);
		expect(bounded).toBeInstanceOf(Request);
		expect(await (bounded as Request).json()).toEqual({ code: 'L1' });
		expect((bounded as Request).headers.get('content-type')).toBe('application/json');
	});
});
