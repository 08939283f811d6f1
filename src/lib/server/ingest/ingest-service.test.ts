import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { existsSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { createHash } from 'node:crypto';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { lines, printRuns, products, stencils } from '../db/schema';
import { importApertures } from '../stencils/apertures';
import { ingestSpiFile, type IngestRequest } from './ingest-service';
import { spareParserThreadId } from './parse-driver';
import { getBoard, searchBoards } from './queries';

const FIXTURES = 'tests/fixtures/spi';
const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result';

async function* chunksOf(text: string | Uint8Array, size = 7): AsyncGenerator<Uint8Array> {
	const bytes = typeof text === 'string' ? new TextEncoder().encode(text) : text;
	// Small chunks: rows, numbers and UTF-8 sequences get cut across chunk boundaries.
	for (let i = 0; i < bytes.length; i += size) yield bytes.subarray(i, i + size);
}

function request(fileName: string, text: string | Uint8Array, extra: Partial<IngestRequest> = {}) {
	return {
		source: 'api',
		fileName,
		body: chunksOf(text),
		createdBy: 'user:1',
		batchSize: 2,
		...extra
	} satisfies IngestRequest;
}

function counts(db: Db) {
	const c = (table: string) =>
		db.$client.prepare(`select count(*) from ${table}`).pluck().get() as number;
	return {
		boards: c('spi_boards'),
		pads: c('spi_pads'),
		measurements: c('spi_pad_measurements'),
		imported: db.$client
			.prepare(`select count(*) from spi_imports where status = 'imported'`)
			.pluck()
			.get() as number
	};
}

let t: ReturnType<typeof openTestDatabase>;
beforeEach(() => {
	t = openTestDatabase();
});
afterEach(() => t.close());

// Database and worker-thread tests: generous timeouts for a shared, busy machine.
describe('ingestSpiFile', { timeout: 60_000 }, () => {
	it('imports the canonical fixture: boards, pads, values read back as written', async () => {
		const text = readFileSync(join(FIXTURES, 'good-canonical.csv'), 'utf8');
		const outcome = await ingestSpiFile(t.db, request('good-canonical.csv', text));
		expect(outcome).toMatchObject({ status: 'imported', rejectedRows: 0 });
		if (outcome.status !== 'imported') return;
		const dataRows = text.trim().split('\n').length - 1;
		expect(outcome.pads).toBe(dataRows);
		const serials = new Set(
			text
				.trim()
				.split('\n')
				.slice(1)
				.map((l) => l.split(',')[0] + l.split(',')[1])
		);
		expect(outcome.boards).toBe(serials.size);
		const [board] = searchBoards(t.db, { serial: 'RB-TESTBOARD-0001' });
		expect(board.padCount).toBe(3);
		const detail = getBoard(t.db, board.id);
		const r7 = detail?.pads.find((p) => p.refdes === 'R7');
		// The fixture's third row: 61.0, 88.4, 96.2, 12.75, -8.0, FAIL
		expect(r7).toMatchObject({
			pad: '1',
			panelIndex: 1,
			volumePct: 61,
			areaPct: 88.4,
			heightUm: 96.2,
			offsetXUm: 12.75,
			offsetYUm: -8,
			result: 'fail'
		});
		// Aggregates: mean of the fixture's three volume values, counts by result.
		expect(detail?.board.volumePct.mean).toBeCloseTo((98.5 + 102.25 + 61.0) / 3, 12);
		expect(detail?.board.failCount).toBe(1);
		// Original archived under its SHA-256.
		const sha = createHash('sha256').update(text).digest('hex');
		expect(existsSync(join(t.dir, 'archive', sha.slice(0, 2), sha))).toBe(true);
	});

	it('parses on a worker thread with the same result as in this thread', async () => {
		const text = readFileSync(join(FIXTURES, 'good-canonical.csv'), 'utf8');
		const threaded = await ingestSpiFile(t.db, request('t.csv', text, { threaded: true }));
		expect(threaded).toMatchObject({ status: 'imported', threaded: true });
		const dump = () =>
			t.db.$client
				.prepare(
					`select b.serial, b.inspected_at, p.refdes, p.pad, m.volume_centi_pct, m.height_centi_um,
					 m.result, b.volume_pct_mean from spi_pad_measurements m join spi_boards b on b.id = m.board_id
					 join spi_pads p on p.id = m.pad_id order by 1, 2, 3, 4`
				)
				.all();
		const fromThread = dump();
		t.db.$client.exec(
			'delete from spi_pad_measurements; delete from spi_boards; delete from spi_imports'
		);
		const inline = await ingestSpiFile(t.db, request('t.csv', text, { threaded: false }));
		expect(inline).toMatchObject({ status: 'imported', threaded: false });
		expect(dump()).toEqual(fromThread);
		const bad = await ingestSpiFile(
			t.db,
			request('bad.csv', readFileSync(join(FIXTURES, 'non-numeric.csv'), 'utf8'), {
				threaded: true
			})
		);
		expect(bad.status).toBe('rejected');
	}, 60_000); // a worker loading TypeScript through tsx can take seconds on a busy machine

	it('keeps a parser thread that finished cleanly for the next file, archive and hash intact', async () => {
		const text = readFileSync(join(FIXTURES, 'good-canonical.csv'), 'utf8');
		const first = await ingestSpiFile(t.db, request('a.csv', text, { threaded: true }));
		expect(first).toMatchObject({ status: 'imported', threaded: true });
		const spare = spareParserThreadId();
		expect(spare).not.toBeNull();
		// Different bytes (CRLF), same rows: the reused thread hashes and archives this file afresh.
		const crlf = text.replace(/\n/g, '\r\n');
		const second = await ingestSpiFile(t.db, request('b.csv', crlf, { threaded: true }));
		// Same board inspections as the first file: nothing stored twice.
		expect(second).toMatchObject({
			status: 'imported',
			threaded: true,
			boards: 0,
			duplicateBoards: 2
		});
		const bad = await ingestSpiFile(
			t.db,
			request('bad.csv', readFileSync(join(FIXTURES, 'non-numeric.csv'), 'utf8'), {
				threaded: true
			})
		);
		expect(bad.status).toBe('rejected');
		expect(spareParserThreadId()).toBe(spare);
		const rows = t.db.$client
			.prepare(`select file_name, sha256, archive_path from spi_imports order by id`)
			.all() as { file_name: string; sha256: string; archive_path: string | null }[];
		const originals: Record<string, string> = {
			'a.csv': text,
			'b.csv': crlf,
			'bad.csv': readFileSync(join(FIXTURES, 'non-numeric.csv'), 'utf8')
		};
		expect(rows.map((r) => r.file_name)).toEqual(['a.csv', 'b.csv', 'bad.csv']);
		for (const row of rows) {
			const original = originals[row.file_name];
			expect(row.sha256).toBe(createHash('sha256').update(original).digest('hex'));
			expect(row.archive_path).not.toBeNull();
			const archived = readFileSync(
				join(dirname(t.db.$client.name), row.archive_path as string),
				'utf8'
			);
			expect(archived).toBe(original);
		}
	}, 60_000);

	it('stores nothing of a file whose last row is bad, and records the rejection', async () => {
		const good = readFileSync(join(FIXTURES, 'good-canonical.csv'), 'utf8').trimEnd();
		const text = `${good}\nRB-X,2026-03-02T09:00:00Z,L1,PB-100,0,C9,1,abc,100,120,0,0,pass\n`;
		const outcome = await ingestSpiFile(t.db, request('bad-end.csv', text));
		expect(outcome.status).toBe('rejected');
		if (outcome.status !== 'rejected') return;
		const lastRow = text.trimEnd().split('\n').length;
		expect(outcome.errors[0]).toMatchObject({ row: lastRow, column: 'volume_pct' });
		expect(counts(t.db)).toEqual({ boards: 0, pads: 0, measurements: 0, imported: 0 });
		const rec = t.db.$client
			.prepare(`select status, error_count from spi_imports where id = ?`)
			.get(outcome.id);
		expect(rec).toEqual({ status: 'rejected', error_count: 1 });
	});

	it.each([
		['empty.csv', 'file is empty'],
		['header-only.csv', 'no data rows'],
		['missing-columns.csv', ''],
		['wrong-columns.csv', ''],
		['non-numeric.csv', ''],
		['bad-timestamps.csv', ''],
		['truncated-last-line.csv', ''],
		['binary-garbage.csv', ''],
		['latin1-header.csv', 'UTF-8']
	])('rejects %s whole with a located error', async (file, words) => {
		const bytes = readFileSync(join(FIXTURES, file));
		const outcome = await ingestSpiFile(t.db, request(file, new Uint8Array(bytes)));
		expect(outcome.status).toBe('rejected');
		if (outcome.status !== 'rejected') return;
		expect(outcome.errors.length).toBeGreaterThan(0);
		expect(outcome.errors[0].message).toContain(words);
		expect(typeof outcome.errors[0].row).toBe('number');
		expect(counts(t.db)).toEqual({ boards: 0, pads: 0, measurements: 0, imported: 0 });
	});

	it.each(['bom.csv', 'crlf.csv', 'quoted-commas.csv', 'extra-columns.csv'])(
		'accepts %s',
		async (file) => {
			const bytes = readFileSync(join(FIXTURES, file));
			const outcome = await ingestSpiFile(t.db, request(file, new Uint8Array(bytes)));
			expect(outcome.status).toBe('imported');
		}
	);

	it('answers the same content again as a duplicate of the earlier import', async () => {
		const text = readFileSync(join(FIXTURES, 'good-canonical.csv'), 'utf8');
		const first = await ingestSpiFile(t.db, request('a.csv', text));
		const second = await ingestSpiFile(t.db, request('renamed.csv', text));
		expect(second).toMatchObject({ status: 'duplicate', id: first.id });
		const before = counts(t.db);
		expect(before.imported).toBe(1);
		expect(counts(t.db).measurements).toBe(first.status === 'imported' ? first.pads : -1);
	});

	it('stores a board inspection once across files, and keeps a later re-inspection', async () => {
		const row = (time: string, vol: number) => `SN-1,${time},L1,P1,0,C1,1,${vol},100,120,0,0,pass`;
		const a = await ingestSpiFile(
			t.db,
			request('a.csv', `${HEADER}\n${row('2026-03-02T08:00:00Z', 100)}\n`)
		);
		// Same inspection (same serial and instant, written with another offset) plus another board.
		const b = await ingestSpiFile(
			t.db,
			request(
				'b.csv',
				`${HEADER}\n${row('2026-03-02T09:00:00+01:00', 101)}\nSN-2,2026-03-02T08:01:00Z,L1,P1,0,C1,1,99,100,120,0,0,pass\n`
			)
		);
		expect(a).toMatchObject({ status: 'imported', boards: 1, pads: 1 });
		expect(b).toMatchObject({ status: 'imported', boards: 1, pads: 1, duplicateBoards: 1 });
		const c = await ingestSpiFile(
			t.db,
			request('c.csv', `${HEADER}\n${row('2026-03-02T10:00:00Z', 97)}\n`)
		);
		expect(c).toMatchObject({ status: 'imported', boards: 1 });
		const sn1 = searchBoards(t.db, { serial: 'SN-1' });
		expect(sn1.map((s) => s.inspectedAt.toISOString())).toEqual([
			'2026-03-02T10:00:00.000Z',
			'2026-03-02T08:00:00.000Z'
		]);
		// The first file's value is the one kept for the 08:00 inspection.
		expect(getBoard(t.db, sn1[1].id)?.pads[0].volumePct).toBe(100);
	});

	it('rejects a pad measured twice for one board inspection', async () => {
		const r = 'SN-1,2026-03-02T08:00:00Z,L1,P1,0,C1,1,100,100,120,0,0,pass';
		const outcome = await ingestSpiFile(t.db, request('twice.csv', `${HEADER}\n${r}\n${r}\n`));
		expect(outcome).toMatchObject({ status: 'rejected' });
		if (outcome.status === 'rejected') expect(outcome.errors[0]).toMatchObject({ row: 3 });
		expect(counts(t.db).boards).toBe(0);
	});

	it('links boards to the print run whose window holds inspected_at, pads to apertures', async () => {
		const lineId = t.db.insert(lines).values({ code: 'L1', name: 'L1' }).returning().get().id;
		const productId = t.db.insert(products).values({ code: 'P1', name: 'P1' }).returning().get().id;
		const stencilId = t.db
			.insert(stencils)
			.values({ name: 'ST-1', revision: 'A', thicknessUm: 100, technology: 'laser-stainless' })
			.returning()
			.get().id;
		// 1000 × 200 µm rectangle, 100 µm foil: area 200,000 µm², volume 2.0e7 µm³,
		// area ratio = A / (P·t) = 200000 / (2400 · 100) = 0.8333 (IPC-7525 definition).
		importApertures(
			t.db,
			stencilId,
			[
				{
					refdes: 'U1',
					pad: '1',
					shape: 'rectangle',
					lengthUm: 1000,
					widthUm: 200,
					xUm: 0,
					yUm: 0,
					rotationDeg: 0
				}
			],
			{ source: 'json', mode: 'append', fileName: 't' },
			null
		);
		const run = (start: string, end: string | null) =>
			t.db
				.insert(printRuns)
				.values({
					lineId,
					productId,
					stencilId,
					parameters: {},
					startedAt: new Date(start),
					endedAt: end ? new Date(end) : null
				})
				.returning()
				.get().id;
		const early = run('2026-03-02T06:00:00Z', '2026-03-02T07:59:59Z');
		const late = run('2026-03-02T08:00:00Z', null);
		const text =
			`${HEADER},volume_um3\n` +
			`SN-1,2026-03-02T07:30:00Z,L1,P1,0,U1,1,90,100,120,0,0,pass,18000000\n` +
			`SN-2,2026-03-02T08:30:00Z,L1,P1,0,U1,1,110,100,120,0,0,pass,22000000\n` +
			`SN-3,2026-03-02T08:40:00Z,L1,P1,0,U1,1,110,100,120,0,0,pass,22000000\n`;
		const outcome = await ingestSpiFile(t.db, request('links.csv', text));
		expect(outcome.status).toBe('imported');
		const [b1] = searchBoards(t.db, { serial: 'SN-1' });
		const [b2] = searchBoards(t.db, { serial: 'SN-2' });
		expect(b1.printRunId).toBe(early);
		expect(b2.printRunId).toBe(late);
		const d2 = getBoard(t.db, b2.id);
		expect(d2?.board.stencilId).toBe(stencilId);
		// TE = 2.2e7 / 2.0e7 = 1.1
		expect(d2?.pads[0].transferEfficiency).toBeCloseTo(1.1, 12);
		expect(d2?.pads[0].areaRatio).toBeCloseTo(200000 / (2400 * 100), 12);
		expect(d2?.board.te.mean).toBeCloseTo(1.1, 12);
	});
});
