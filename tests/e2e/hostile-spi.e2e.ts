import { expect, test, type APIRequestContext } from '@playwright/test';
import Database from 'better-sqlite3';
import { CANONICAL_PROFILE } from '../../src/lib/ingest/mapping-profile';
import { bearer, E2E_DATABASE, tokenFor } from './helpers';

/**
 * Hostile SPI files and mapping profiles through the HTTP API: each is refused with a 4xx that
 * names the row, column and field (README, SPI "Limits"), the server still answers, and nothing
 * of the file is stored.
 */

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';

/** Stored SPI data, read from the e2e database (tests run one at a time). */
function storedCounts() {
	const db = new Database(E2E_DATABASE, { readonly: true, fileMustExist: true });
	try {
		const count = (sql: string) => db.prepare(sql).pluck().get() as number;
		return {
			boards: count('select count(*) from spi_boards'),
			measurements: count('select count(*) from spi_pad_measurements'),
			imported: count(`select count(*) from spi_imports where status = 'imported'`)
		};
	} finally {
		db.close();
	}
}

async function healthy(request: APIRequestContext) {
	const health = await request.get('/api/health');
	expect(health.status()).toBe(200);
}

function goodRow(serial: string) {
	return `${serial},2026-03-02T08:00:00Z,SMT-1,PB-100,0,C1,1,100,100,120,0,0,pass`;
}

async function upload(request: APIRequestContext, body: Buffer, query = 'fileName=hostile.csv') {
	return request.post(`/api/spi/imports?${query}`, {
		headers: { ...bearer(tokenFor('quality')), 'content-type': 'text/csv' },
		data: body,
		timeout: 120_000
	});
}

test.describe('hostile SPI files over HTTP', () => {
	test('numbers outside plain decimal notation: 422 naming row, column and field; nothing stored', async ({
		request
	}) => {
		const tag = `HS-${Date.now()}`;
		const before = storedCounts();
		for (const [cell, message] of [
			['0x10', 'volume_pct is not a number: "0x10"'],
			['0b11', 'volume_pct is not a number: "0b11"'],
			['0o17', 'volume_pct is not a number: "0o17"'],
			['1e308', 'volume_pct 1e+308 is outside 0 to 1000 %'],
			['Infinity', 'volume_pct is not a number: "Infinity"'],
			['NaN', 'volume_pct is not a number: "NaN"'],
			['1_000', 'volume_pct is not a number: "1_000"'],
			['+-1', 'volume_pct is not a number: "+-1"'],
			['\uff11\uff12', 'volume_pct is not a number: "\uff11\uff12"']
		]) {
			const bad = goodRow(`${tag}-2`).replace(',100,100,', `,${cell},100,`);
			const res = await upload(request, Buffer.from(`${HEADER}\n${goodRow(`${tag}-1`)}\n${bad}\n`));
			expect(res.status(), cell).toBe(422);
			const body = await res.json();
			expect(body.status).toBe('rejected');
			expect(body.errors, cell).toEqual([{ row: 3, column: 'volume_pct', message }]);
		}
		await healthy(request);
		expect(storedCounts()).toEqual(before);
	});

	test('a NUL byte and invalid UTF-8: 422 naming the byte and line; nothing stored', async ({
		request
	}) => {
		const before = storedCounts();
		const head = Buffer.from(`${HEADER}\n${goodRow(`HS-NUL-${Date.now()}`)}\n`);
		const nul = await upload(request, Buffer.concat([head, Buffer.from('RB\u0000,x\n')]));
		expect(nul.status()).toBe(422);
		expect((await nul.json()).errors).toEqual([
			{
				row: 0,
				column: null,
				message: `file is not text: NUL byte at byte ${head.length + 2} (line 3); is it a binary export?`
			}
		]);
		const utf8 = await upload(
			request,
			Buffer.concat([head, Buffer.from([0x52, 0xc0, 0xaf, 0x0a])])
		);
		expect(utf8.status()).toBe(422);
		expect((await utf8.json()).errors).toEqual([
			{
				row: 0,
				column: null,
				message: `file is not valid UTF-8 text (byte 0xC0 at byte ${head.length + 1}, line 3); save or export it as UTF-8`
			}
		]);
		await healthy(request);
		expect(storedCounts()).toEqual(before);
	});

	test('50 MB without a line feed: 422 "line 2 is longer than the limit"; the server answers on', async ({
		request
	}) => {
		test.setTimeout(180_000);
		const before = storedCounts();
		const body = Buffer.concat([Buffer.from(`${HEADER}\n`), Buffer.alloc(50 * 1024 * 1024, 'a')]);
		const res = await upload(request, body, `fileName=flat-${Date.now()}.csv`);
		expect(res.status()).toBe(422);
		expect((await res.json()).errors).toEqual([
			{
				row: 2,
				column: null,
				message:
					'line 2 is longer than the limit of 1 MiB (SPI_MAX_LINE_BYTES); is this a text export with line breaks?'
			}
		]);
		await healthy(request);
		expect(storedCounts()).toEqual(before);
		// The next file imports (the parser thread, if it took the file, is ready again).
		const serial = `HS-AFTER-${Date.now()}`;
		const next = await upload(request, Buffer.from(`${HEADER}\n${goodRow(serial)}\n`));
		expect(next.status()).toBe(201);
		expect(await next.json()).toMatchObject({ status: 'imported', boards: 1, pads: 1 });
	});
});

test.describe('serial patterns run on RE2', () => {
	test('a back-reference or look-ahead is refused on save with 400 naming the field and why', async ({
		request
	}) => {
		for (const [pattern, detail] of [
			['^(RB)-\\1', 'invalid escape sequence: `\\1`'],
			['^(RB-\\d+)(?=_)', 'invalid or unsupported Perl syntax: `(?=`']
		]) {
			const res = await request.post('/api/spi/profiles', {
				headers: bearer(tokenFor('quality')),
				data: {
					...CANONICAL_PROFILE,
					name: `E2E RE2 refused ${Date.now()}`,
					serialFromFileName: { pattern }
				}
			});
			expect(res.status(), pattern).toBe(400);
			expect((await res.json()).fields).toEqual([
				{
					field: 'serialFromFileName.pattern',
					message: `serial pattern is not valid RE2 syntax: ${detail} (back-references and look-around are not supported)`
				}
			]);
		}
		await healthy(request);
	});

	test('(a+)+$ against a long file name answers at once (422), and the server answers on', async ({
		request
	}) => {
		const saved = await request.post('/api/spi/profiles', {
			headers: bearer(tokenFor('quality')),
			data: {
				...CANONICAL_PROFILE,
				name: `E2E ReDoS ${Date.now()}`,
				serialFromFileName: { pattern: '(a+)+$' }
			}
		});
		expect(saved.status()).toBe(201);
		const { id } = await saved.json();
		const before = storedCounts();
		// A backtracking engine needs ~2^8000 steps here; a URL of 8 kB stays within header limits.
		const name = 'a'.repeat(8000) + '!';
		const res = await upload(
			request,
			Buffer.from(`${HEADER}\n${goodRow(`HS-REDOS-${Date.now()}`)}\n`),
			`fileName=${name}&profile=${id}`
		);
		expect(res.status()).toBe(422);
		expect((await res.json()).errors).toEqual([
			{
				row: 0,
				column: null,
				message: `file name "${name}" does not match the serial pattern /(a+)+$/`
			}
		]);
		await healthy(request);
		expect(storedCounts()).toEqual(before);
	});
});
