import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import { openImportRow } from './import-row';
import type { IngestRequest } from './ingest-types';

let t: ReturnType<typeof openTestDatabase>;
beforeEach(() => {
	t = openTestDatabase();
});
afterEach(() => t.close());

const request: IngestRequest = {
	source: 'api',
	fileName: 'a.csv',
	body: [] as unknown as AsyncIterable<Uint8Array>,
	createdBy: 'user:1'
};

describe('openImportRow', () => {
	it("writes an 'importing' row and reserves the ids it hands out only on reserve()", () => {
		const c = t.db.$client;
		const seq = (table: string) =>
			c.prepare(`select seq from sqlite_sequence where name = ?`).pluck().get(table) ?? 0;
		const row = c.transaction(() => openImportRow(c, request, 1000))();
		const imported = c
			.prepare(`select status, board_id_from, board_id_to from spi_imports where id = ?`)
			.get(row.importId);
		expect(imported).toEqual({ status: 'importing', board_id_from: 1, board_id_to: 0 });
		expect([row.takeBoardId(), row.takeBoardId(), row.takePadId()]).toEqual([1, 2, 1]);
		expect(seq('spi_boards')).toBe(0);
		c.transaction(() => row.reserve())();
		expect([seq('spi_boards'), seq('spi_pads')]).toEqual([2, 1]);
		expect(
			c.prepare(`select board_id_to from spi_imports where id = ?`).pluck().get(row.importId)
		).toBe(2);
		// A second import starts past the reserved ids, even though no board row exists yet.
		const next = c.transaction(() => openImportRow(c, request, 2000))();
		expect(next.takeBoardId()).toBe(3);
	});
});
