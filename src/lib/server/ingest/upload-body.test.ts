import { describe, expect, it } from 'vitest';
import { ApiError } from '../api';
import { checkDeclaredSize, limitBytes, multipartFile, rawBody, readAhead } from './upload-body';

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
		expect(err.body().error).toContain('"file"');
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
			expect((err as ApiError).body().error).toMatch(
				/2048 MB; the largest accepted file is 1024 MB/
			);
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
		expect(cut.body().error).toContain('interrupted');
	});
});

describe('rawBody', () => {
	it('reads an absent body as an empty file (the parser then says "file is empty")', async () => {
		const { rawBody } = await import('./upload-body');
		const request = new Request('http://localhost/', { method: 'POST' });
		expect(await text(rawBody(request))).toBe('');
	});
});

describe('readAhead', () => {
	/** `count` chunks of `size` bytes, byte i of the whole stream = i mod 251; counts what was pulled. */
	function source(count: number, size: number, fail?: Error) {
		const state = { pulled: 0, closed: false };
		async function* gen() {
			try {
				for (let c = 0; c < count; c++) {
					const chunk = new Uint8Array(size);
					for (let i = 0; i < size; i++) chunk[i] = (c * size + i) % 251;
					state.pulled++;
					yield chunk;
				}
				if (fail) throw fail;
			} finally {
				state.closed = true;
			}
		}
		return { body: gen(), state };
	}
	const tick = () => new Promise((r) => setTimeout(r, 0));

	it('hands the bytes on unchanged in batches of at least batchBytes (the last may be smaller)', async () => {
		const { body } = source(25, 40);
		const sizes: number[] = [];
		const all: number[] = [];
		for await (const batch of readAhead(body, { batchBytes: 100, aheadBytes: 300 })) {
			sizes.push(batch.length);
			all.push(...batch);
		}
		// 1,000 bytes: batches of 120 (three 40-byte chunks reach 100), the rest at the end.
		expect(sizes).toEqual([120, 120, 120, 120, 120, 120, 120, 120, 40]);
		expect(all).toEqual(Array.from({ length: 1000 }, (_, i) => i % 251));
	});

	it('keeps reading while the consumer is busy, but no further than aheadBytes', async () => {
		const { body, state } = source(100, 40);
		const it = readAhead(body, { batchBytes: 100, aheadBytes: 200 })[Symbol.asyncIterator]();
		const first = await it.next();
		expect(first.value?.length).toBe(120);
		for (let i = 0; i < 5; i++) await tick();
		// 3 chunks taken, then 200 bytes (5 chunks) read ahead while nobody asked.
		expect(state.pulled).toBe(8);
		await it.return(undefined);
	});

	it('gives the bytes read before a broken stream, then its error (mapped by limitBytes)', async () => {
		const broken = Object.assign(new Error('body too large'), { status: 413 });
		const { body } = source(3, 40, broken);
		const seen: number[] = [];
		const err = await (async () => {
			for await (const batch of limitBytes(readAhead(body, { batchBytes: 100 }), 1000))
				seen.push(batch.length);
		})().catch((e) => e);
		expect(seen).toEqual([120]);
		expect(err).toBeInstanceOf(ApiError);
		expect(err.status).toBe(413);
	});

	it('stops the source when the consumer stops early', async () => {
		const { body, state } = source(1000, 40);
		for await (const batch of readAhead(body, { batchBytes: 100, aheadBytes: 200 })) {
			expect(batch.length).toBe(120);
			break;
		}
		for (let i = 0; i < 5; i++) await tick();
		expect(state.closed).toBe(true);
		expect(state.pulled).toBeLessThan(20);
	});
});

describe('rawBody of a streamed request', () => {
	it('reads the chunks in order and cancels the stream when the reader stops early', async () => {
		let cancelled = false;
		let sent = 0;
		const stream = new ReadableStream<Uint8Array>({
			pull(controller) {
				controller.enqueue(new TextEncoder().encode(`line ${sent++}\n`));
				if (sent === 1000) controller.close();
			},
			cancel() {
				cancelled = true;
			}
		});
		const request = new Request('http://localhost/', {
			method: 'POST',
			body: stream,
			// @ts-expect-error Node's fetch needs this for a streamed body
			duplex: 'half'
		});
		let got = '';
		for await (const chunk of rawBody(request)) {
			got += new TextDecoder().decode(chunk);
			if (got.length > 50) break;
		}
		expect(got.startsWith('line 0\nline 1\nline 2\n')).toBe(true);
		await new Promise((r) => setTimeout(r, 0));
		expect(cancelled).toBe(true);
	});
});
