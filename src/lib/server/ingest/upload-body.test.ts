import { describe, expect, it } from 'vitest';
import { ApiError } from '../api';
import { checkDeclaredSize, limitBytes, multipartFile } from './upload-body';

async function text(body: AsyncIterable<Uint8Array>): Promise<string> {
	const parts: Buffer[] = [];
	for await (const c of body) parts.push(Buffer.from(c));
	return Buffer.concat(parts).toString('utf8');
}

function multipart(form: FormData): Request {
	return new Request('http://localhost/api/spi/imports', { method: 'POST', body: form });
}

describe('multipartFile', () => {
	it('streams the file part and returns the fields sent before it', async () => {
		const form = new FormData();
		form.append('profile', '3');
		form.append('file', new Blob(['a,b\n1,2\n'], { type: 'text/csv' }), 'x.csv');
		const file = await multipartFile(multipart(form));
		expect(file.fileName).toBe('x.csv');
		expect(file.fields).toEqual({ profile: '3' });
		expect(await text(file.body)).toBe('a,b\n1,2\n');
	});

	it('answers 400 naming the field when there is no file part', async () => {
		const form = new FormData();
		form.append('profile', '3');
		const err = await multipartFile(multipart(form)).catch((e) => e);
		expect(err).toBeInstanceOf(ApiError);
		expect(err.status).toBe(400);
		expect(err.body.error).toContain('"file"');
	});
});

describe('size limits', () => {
	it.each([
		[null, 100, null],
		['100', 100, 100],
		['0', 100, 0]
	])('content-length %s within %i bytes passes (%s)', (length, limit, expected) => {
		const headers: Record<string, string> = length === null ? {} : { 'content-length': length };
		const request = new Request('http://localhost/', { method: 'POST', headers, body: 'x' });
		if (length === null) request.headers.delete('content-length');
		expect(checkDeclaredSize(request, limit)).toBe(expected);
	});

	it('refuses a declared 2 GB body with 413 and the limit in MB', () => {
		const request = new Request('http://localhost/', {
			method: 'POST',
			headers: { 'content-length': String(2 * 1024 ** 3) }
		});
		try {
			checkDeclaredSize(request, 1024 * 1024 * 1024);
			expect.unreachable();
		} catch (err) {
			expect((err as ApiError).status).toBe(413);
			expect((err as ApiError).body.error).toMatch(/2048 MB; the largest accepted file is 1024 MB/);
		}
	});

	it('cuts a streamed body off with 413 once it passes the limit, and turns a broken stream into 400', async () => {
		async function* chunks() {
			for (let i = 0; i < 10; i++) yield new Uint8Array(40);
		}
		const over = await text(limitBytes(chunks(), 100)).catch((e) => e);
		expect(over.status).toBe(413);
		async function* broken() {
			yield new Uint8Array(1);
			throw new Error('socket hang up');
		}
		const cut = await text(limitBytes(broken(), 100)).catch((e) => e);
		expect(cut.status).toBe(400);
		expect(cut.body.error).toContain('interrupted');
	});
});

describe('rawBody', () => {
	it('reads an absent body as an empty file (the parser then says "file is empty")', async () => {
		const { rawBody } = await import('./upload-body');
		const request = new Request('http://localhost/', { method: 'POST' });
		expect(await text(rawBody(request))).toBe('');
	});
});
