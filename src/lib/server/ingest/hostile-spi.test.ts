import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import { CANONICAL_PROFILE, type MappingProfile } from '$lib/ingest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { ingestSpiFile, type IngestRequest } from './ingest-service';
import { listProfiles, resolveImportProfile, saveProfile } from './profiles';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';
const GOOD = 'RB-H1,2026-03-02T08:00:00Z,L1,PB-100,0,C1,1,100,100,120,0,0,pass';

async function* chunksOf(bytes: Uint8Array, size: number): AsyncGenerator<Uint8Array> {
	for (let i = 0; i < bytes.length; i += size) yield bytes.subarray(i, i + size);
}

function request(
	fileName: string,
	content: string | Uint8Array,
	extra: Partial<IngestRequest> = {},
	chunkBytes = 4096
): IngestRequest {
	const bytes = typeof content === 'string' ? new TextEncoder().encode(content) : content;
	return {
		source: 'api',
		fileName,
		body: chunksOf(bytes, chunkBytes),
		createdBy: 'user:1',
		...extra
	};
}

function stored(db: Db) {
	const c = (sql: string) => db.$client.prepare(sql).pluck().get() as number;
	return {
		boards: c('select count(*) from spi_boards'),
		pads: c('select count(*) from spi_pads'),
		measurements: c('select count(*) from spi_pad_measurements'),
		imported: c(`select count(*) from spi_imports where status = 'imported'`)
	};
}

const NOTHING = { boards: 0, pads: 0, measurements: 0, imported: 0 };

let t: ReturnType<typeof openTestDatabase>;
const savedEnv = { ...process.env };
beforeEach(() => {
	t = openTestDatabase();
});
afterEach(() => {
	t.close();
	for (const key of Object.keys(process.env)) if (!(key in savedEnv)) delete process.env[key];
	Object.assign(process.env, savedEnv);
});

describe(
	'hostile SPI files through ingestSpiFile: refused, named, nothing stored',
	{ timeout: 120_000 },
	() => {
		it.each([
			['0x10', 'volume_pct', 'volume_pct is not a number: "0x10"'],
			['0b11', 'volume_pct', 'volume_pct is not a number: "0b11"'],
			['0o17', 'volume_pct', 'volume_pct is not a number: "0o17"'],
			['1e308', 'volume_pct', 'volume_pct 1e+308 is outside 0 to 1000 %'],
			['Infinity', 'volume_pct', 'volume_pct is not a number: "Infinity"'],
			['NaN', 'volume_pct', 'volume_pct is not a number: "NaN"'],
			['1_000', 'volume_pct', 'volume_pct is not a number: "1_000"'],
			['+-1', 'volume_pct', 'volume_pct is not a number: "+-1"'],
			['\uff11\uff12', 'volume_pct', 'volume_pct is not a number: "\uff11\uff12"'],
			['\u00a012', 'volume_pct', 'volume_pct is not a number: "\\u00A012"']
		])('volume %j', async (cell, column, message) => {
			const bad = GOOD.replace(',100,100,', `,${cell},100,`);
			const outcome = await ingestSpiFile(
				t.db,
				request('numbers.csv', `${HEADER}\n${GOOD}\n${bad}\n`)
			);
			expect(outcome).toMatchObject({
				status: 'rejected',
				errorCount: 1,
				errors: [{ row: 3, column, message }]
			});
			expect(stored(t.db)).toEqual(NOTHING);
		});

		it('a NUL byte', async () => {
			const bytes = new TextEncoder().encode(`${HEADER}\n${GOOD}\nRB-H1\u0000\n`);
			const outcome = await ingestSpiFile(t.db, request('nul.csv', bytes));
			expect(outcome).toMatchObject({
				status: 'rejected',
				errors: [
					{
						row: 0,
						column: null,
						message: `file is not text: NUL byte at byte ${HEADER.length + GOOD.length + 7} (line 3); is it a binary export?`
					}
				]
			});
			expect(stored(t.db)).toEqual(NOTHING);
		});

		it('invalid UTF-8', async () => {
			const head = new TextEncoder().encode(
				`${HEADER}\n${GOOD}\nRB-H1,2026-03-02T08:00:00Z,L1,PB-100,0,C`
			);
			const bytes = new Uint8Array([
				...head,
				0xff,
				...new TextEncoder().encode(',2,1,1,1,0,0,pass\n')
			]);
			const outcome = await ingestSpiFile(t.db, request('utf8.csv', bytes));
			expect(outcome).toMatchObject({
				status: 'rejected',
				errors: [
					{
						row: 0,
						column: null,
						message: `file is not valid UTF-8 text (byte 0xFF at byte ${head.length}, line 3); save or export it as UTF-8`
					}
				]
			});
			expect(stored(t.db)).toEqual(NOTHING);
		});

		it('8 MB without a line feed after a good row', async () => {
			const flat = new Uint8Array(8 * 1024 * 1024).fill(0x61);
			const head = new TextEncoder().encode(`${HEADER}\n${GOOD}\n`);
			const bytes = new Uint8Array(head.length + flat.length);
			bytes.set(head);
			bytes.set(flat, head.length);
			const outcome = await ingestSpiFile(t.db, request('flat.csv', bytes, {}, 65536));
			expect(outcome).toMatchObject({
				status: 'rejected',
				errors: [
					{
						row: 3,
						column: null,
						message:
							'line 3 is longer than the limit of 1 MiB (SPI_MAX_LINE_BYTES); is this a text export with line breaks?'
					}
				]
			});
			expect(stored(t.db)).toEqual(NOTHING);
		});

		it('a header of 5,000 columns', async () => {
			const outcome = await ingestSpiFile(
				t.db,
				request('wide.csv', `${HEADER}${',x'.repeat(4987)}\n${GOOD}\n`)
			);
			expect(outcome).toMatchObject({
				status: 'rejected',
				errors: [
					{
						row: 1,
						column: null,
						message: 'header has 5000 columns, more than the limit of 1000 (SPI_MAX_COLUMNS)'
					}
				]
			});
			expect(stored(t.db)).toEqual(NOTHING);
		});

		it('more boards than SPI_MAX_BOARDS_PER_FILE', async () => {
			process.env.SPI_MAX_BOARDS_PER_FILE = '3';
			const rows = [0, 1, 2, 3].map((i) => GOOD.replace('RB-H1', `RB-H${i}`));
			const outcome = await ingestSpiFile(
				t.db,
				request('boards.csv', [HEADER, ...rows].join('\n'))
			);
			expect(outcome).toMatchObject({
				status: 'rejected',
				errors: [
					{
						row: 5,
						column: 'board_serial',
						message:
							'board inspection RB-H3 is one more than the limit of 3 per file (SPI_MAX_BOARDS_PER_FILE); split the export'
					}
				]
			});
			expect(stored(t.db)).toEqual(NOTHING);
		});

		it('a parser thread out of memory rejects the file, and the next file imports', async () => {
			// The board budget is lifted so only the thread's memory ceiling can stop the file.
			process.env.SPI_PARSE_MEMORY_MB = '64';
			process.env.SPI_MAX_BOARDS_PER_FILE = '1000000000';
			let text = HEADER + '\n';
			for (let i = 0; i < 400_000; i++) text += GOOD.replace('RB-H1', `RB-OOM-${i}`) + '\n';
			const outcome = await ingestSpiFile(
				t.db,
				request('many-boards.csv', text, { threaded: true }, 65536)
			);
			expect(outcome).toMatchObject({
				status: 'rejected',
				errors: [
					{
						row: 0,
						column: null,
						message:
							"reading this file needed more than the parser's memory limit of 64 MB (SPI_PARSE_MEMORY_MB) and was stopped; nothing was imported. Split the export, or raise the limit"
					}
				]
			});
			expect(stored(t.db)).toEqual(NOTHING);

			delete process.env.SPI_PARSE_MEMORY_MB;
			delete process.env.SPI_MAX_BOARDS_PER_FILE;
			const next = await ingestSpiFile(
				t.db,
				request('next.csv', `${HEADER}\n${GOOD}\n`, { threaded: true })
			);
			expect(next).toMatchObject({ status: 'imported', boards: 1, pads: 1, threaded: true });
		});
	}
);

describe('serial patterns on RE2', { timeout: 60_000 }, () => {
	const withPattern = (pattern: string): MappingProfile => ({
		...CANONICAL_PROFILE,
		name: `per-board ${pattern}`,
		serialFromFileName: { pattern }
	});

	it.each([
		['^(RB)-\\1', 'invalid escape sequence: `\\1`'],
		['^(RB-\\d+)(?=_)', 'invalid or unsupported Perl syntax: `(?=`'],
		['(?<!x)(RB)', 'invalid named capture: `(?<!x)(RB)`']
	])('refuses %j on save, naming the field and why; nothing stored', (pattern, detail) => {
		let error: unknown;
		try {
			saveProfile(t.db, null, withPattern(pattern), null);
		} catch (e) {
			error = e;
		}
		expect(error).toBeInstanceOf(ZodError);
		expect((error as ZodError).issues.map((i) => [i.path.join('.'), i.message])).toEqual([
			[
				'serialFromFileName.pattern',
				`serial pattern is not valid RE2 syntax: ${detail} (back-references and look-around are not supported)`
			]
		]);
		expect(listProfiles(t.db)).toEqual([]);
	});

	it('(a+)+$ is saved (RE2 runs it in linear time) and a 100,000-character name does not stall the import', async () => {
		const saved = saveProfile(t.db, null, withPattern('(a+)+$'), null);
		const { profile, profileId } = resolveImportProfile(t.db, String(saved.id));
		const name = 'a'.repeat(100_000) + '!';
		const outcome = await ingestSpiFile(
			t.db,
			request(name, `${HEADER}\n${GOOD}\n`, { profile, profileId })
		);
		expect(outcome).toMatchObject({
			status: 'rejected',
			errors: [
				{
					row: 0,
					column: null,
					message: `file name "${name}" does not match the serial pattern /(a+)+$/`
				}
			]
		});
		expect(stored(t.db)).toEqual(NOTHING);
	});

	it('a stored pattern from before RE2 rejects the file with the reason instead of failing', async () => {
		t.db.$client
			.prepare(`insert into spi_profiles (name, machine, profile, created_by) values (?, ?, ?, ?)`)
			.run('legacy', 'X', JSON.stringify(withPattern('^(RB-\\d+)(?=_)')), 'system');
		const { profile, profileId } = resolveImportProfile(t.db, 'legacy');
		const outcome = await ingestSpiFile(
			t.db,
			request('RB-7_top.csv', `${HEADER}\n${GOOD}\n`, { profile, profileId })
		);
		expect(outcome).toMatchObject({
			status: 'rejected',
			errors: [
				{
					row: 0,
					column: null,
					message:
						"the profile's serial pattern is not valid RE2 syntax: invalid or unsupported Perl syntax: `(?=` (back-references and look-around are not supported); edit the mapping profile"
				}
			]
		});
		expect(stored(t.db)).toEqual(NOTHING);
	});
});
