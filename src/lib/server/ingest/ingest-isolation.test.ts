import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import Database from 'better-sqlite3';
import { copyFileSync, existsSync } from 'node:fs';
import { join } from 'node:path';
import { openDatabase, type Db } from '../db';
import { openTestDatabase } from '../testing';
import { ingestSpiFile, recoverInterruptedImports, type IngestRequest } from './ingest-service';

const HEADER =
	'board_serial,inspected_at,line,product,panel_index,refdes,pad,volume_pct,area_pct,height_um,offset_x_um,offset_y_um,result\n';
const PADS_PER_BOARD = 200;

/** Canonical rows of board `b` (200 pads), invented serials. */
function boardRows(b: number, serialPrefix = 'FW-ISO'): string {
	const at = new Date(Date.parse('2026-03-02T06:00:00Z') + b * 20_000).toISOString();
	let out = '';
	for (let p = 0; p < PADS_PER_BOARD; p++)
		out += `${serialPrefix}-${b},${at},SMT-1,PB-100,0,C${p},1,${100 + (p % 7)},99.5,121.25,1.5,-2,pass\n`;
	return out;
}

/**
 * A file of `boards` boards streamed in pieces; after `pauseAfterBoards` boards it waits until
 * `resume()` is called (the ingest then waits for bytes, as it does for a slow upload).
 */
function pausedBody(boards: number, pauseAfterBoards: number, tail = '', prefix = 'FW-ISO') {
	let resume!: () => void;
	const resumed = new Promise<void>((r) => (resume = r));
	let paused!: () => void;
	const reachedPause = new Promise<void>((r) => (paused = r));
	async function* body(): AsyncGenerator<Uint8Array> {
		const enc = new TextEncoder();
		yield enc.encode(HEADER);
		for (let b = 0; b < boards; b++) {
			if (b === pauseAfterBoards) {
				paused();
				await resumed;
			}
			yield enc.encode(boardRows(b, prefix));
		}
		if (tail) yield enc.encode(tail);
	}
	return { body: body(), reachedPause, resume };
}

function request(body: AsyncIterable<Uint8Array>, fileName = 'iso.csv'): IngestRequest {
	return { source: 'api', fileName, body, createdBy: 'user:1', threaded: false };
}

function counts(conn: Database.Database) {
	const n = (q: string) => conn.prepare(q).pluck().get() as number;
	return {
		boards: n('select count(*) from spi_boards'),
		pads: n('select count(*) from spi_pads'),
		// What readers reach: measurements of stored boards.
		visibleMeasurements: n(
			'select count(*) from spi_pad_measurements m join spi_boards b on b.id = m.board_id'
		),
		allMeasurements: n('select count(*) from spi_pad_measurements'),
		imported: n(`select count(*) from spi_imports where status = 'imported'`)
	};
}

let t: ReturnType<typeof openTestDatabase>;
beforeEach(() => {
	t = openTestDatabase();
});
afterEach(() => t.close());

describe('SPI import isolation', { timeout: 120_000 }, () => {
	it('commits pad rows in chunks no reader sees, holds no lock between chunks, then shows all', async () => {
		// 200 boards × 200 pads = 40,000 rows: more than two chunks are written before the pause.
		const file = pausedBody(200, 150);
		const outcome = ingestSpiFile(t.db, request(file.body));
		await file.reachedPause;
		// Another connection of the same database, as another request or process would use.
		const other = new Database(t.db.$client.name);
		other.pragma('busy_timeout = 0');
		try {
			const during = counts(other);
			expect(during.allMeasurements).toBeGreaterThan(0); // chunks are committed …
			expect(during).toMatchObject({ boards: 0, pads: 0, visibleMeasurements: 0, imported: 0 });
			// … and no write lock is held while the import waits for bytes: this write needs none to wait.
			other.prepare(`insert into lines (code, name) values ('L-ISO', 'Isolation line')`).run();
			t.db.$client.prepare(`update lines set name = 'Renamed' where code = 'L-ISO'`).run();
			file.resume();
			const done = await outcome;
			expect(done).toMatchObject({ status: 'imported', boards: 200, pads: 40_000 });
			expect(counts(other)).toEqual({
				boards: 200,
				pads: PADS_PER_BOARD,
				visibleMeasurements: 40_000,
				allMeasurements: 40_000,
				imported: 1
			});
			const row = other
				.prepare(`select status, board_id_from, board_id_to from spi_imports`)
				.get() as Record<string, unknown>;
			expect(row).toEqual({ status: 'imported', board_id_from: null, board_id_to: null });
		} finally {
			other.close();
		}
	});

	it('removes the chunk rows of a file rejected at its last row and records the rejection', async () => {
		const bad = 'FW-ISO-X,2026-03-02T09:00:00Z,SMT-1,PB-100,0,C1,1,abc,100,120,0,0,pass\n';
		const file = pausedBody(200, -1, bad);
		const outcome = await ingestSpiFile(t.db, request(file.body));
		expect(outcome).toMatchObject({ status: 'rejected', errorCount: 1 });
		expect(counts(t.db.$client)).toEqual({
			boards: 0,
			pads: 0,
			visibleMeasurements: 0,
			allMeasurements: 0,
			imported: 0
		});
		const rec = t.db.$client.prepare(`select status, board_id_to from spi_imports`).get();
		expect(rec).toEqual({ status: 'rejected', board_id_to: null });
	});

	it('removes the chunk rows of a duplicate file and keeps the first import whole', async () => {
		const first = await ingestSpiFile(t.db, request(pausedBody(120, -1).body, 'a.csv'));
		expect(first).toMatchObject({ status: 'imported', pads: 24_000 });
		const second = await ingestSpiFile(t.db, request(pausedBody(120, -1).body, 'b.csv'));
		expect(second).toMatchObject({ status: 'duplicate', id: first.id });
		expect(counts(t.db.$client)).toMatchObject({
			boards: 120,
			visibleMeasurements: 24_000,
			allMeasurements: 24_000,
			imported: 1
		});
	});

	it('after a stop mid-import: start-up cleanup removes the partial rows; the file then imports whole', async () => {
		const kept = await ingestSpiFile(
			t.db,
			request(pausedBody(3, -1, '', 'FW-KEPT').body, 'kept.csv')
		);
		expect(kept.status).toBe('imported');
		const before = counts(t.db.$client);
		const file = pausedBody(200, 150);
		const running = ingestSpiFile(t.db, request(file.body));
		await file.reachedPause;
		// The database files as a killed server leaves them: committed chunks, no open transaction.
		const crashed = join(t.dir, 'crashed.db');
		copyFileSync(t.db.$client.name, crashed);
		if (existsSync(`${t.db.$client.name}-wal`))
			copyFileSync(`${t.db.$client.name}-wal`, `${crashed}-wal`);
		file.resume();
		await running;

		const db: Db = openDatabase(crashed);
		try {
			expect(counts(db.$client).allMeasurements).toBeGreaterThan(before.allMeasurements);
			expect(await recoverInterruptedImports(db)).toBe(1);
			expect(db.$client.pragma('integrity_check', { simple: true })).toBe('ok');
			expect(counts(db.$client)).toEqual(before);
			const rec = db.$client
				.prepare(`select status, errors from spi_imports where file_name = 'iso.csv'`)
				.get() as { status: string; errors: string };
			expect(rec.status).toBe('rejected');
			expect(rec.errors).toContain('server stopped');
			expect(await recoverInterruptedImports(db)).toBe(0);
			const again = await ingestSpiFile(db, request(pausedBody(200, -1).body));
			expect(again).toMatchObject({ status: 'imported', boards: 200, pads: 40_000 });
			expect(counts(db.$client).visibleMeasurements).toBe(before.visibleMeasurements + 40_000);
			expect(counts(db.$client).allMeasurements).toBe(before.allMeasurements + 40_000);
		} finally {
			db.$client.close();
		}
	});
});
