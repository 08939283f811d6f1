import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import type { BoardHeader } from '$lib/ingest';
import { openTestDatabase } from '../testing';
import { createBoardResolver, printRunNumber } from './board-resolver';

let t: ReturnType<typeof openTestDatabase>;
beforeEach(() => {
	t = openTestDatabase();
});
afterEach(() => t.close());

const board = (values: Partial<BoardHeader> = {}): BoardHeader => ({
	index: 0,
	boardSerial: 'RB-R1',
	inspectedAtMs: Date.UTC(2026, 2, 2, 8),
	lineCode: 'LR',
	productCode: 'PR-R',
	stencil: null,
	printRun: null,
	firstLine: 2,
	...values
});

describe('createBoardResolver', () => {
	it('finds line, product and the print run running at inspection time', () => {
		const c = t.db.$client;
		const lineId = Number(
			c.prepare(`insert into lines (code, name) values ('LR', 'Line R')`).run().lastInsertRowid
		);
		const productId = Number(
			c.prepare(`insert into products (code, name) values ('PR-R', 'P')`).run().lastInsertRowid
		);
		const runId = Number(
			c
				.prepare(
					`insert into print_runs (line_id, product_id, parameters, started_at) values (?, ?, '{}', ?)`
				)
				.run(lineId, productId, Date.UTC(2026, 2, 2, 7)).lastInsertRowid
		);
		const resolver = createBoardResolver(t.db, c);
		expect(resolver.resolve(board())).toEqual({
			lineId,
			productId,
			printRunId: runId,
			stencilId: null,
			stored: false,
			apertures: null
		});
		// Named by the file: the run is taken by its number, not by time.
		expect(resolver.resolve(board({ printRun: `PR-${runId + 1}` })).printRunId).toBeNull();
		expect(resolver.resolve(board({ printRun: `#${runId}` })).printRunId).toBe(runId);
	});

	it('knows nothing of unknown lines, products and stencils', () => {
		const resolved = createBoardResolver(t.db, t.db.$client).resolve(
			board({ lineCode: 'nope', stencil: 'ST-none' })
		);
		expect(resolved).toMatchObject({ lineId: null, productId: null, stencilId: null });
	});
});

describe('printRunNumber', () => {
	it.each([
		['17', 17],
		['#17', 17],
		['PR-17', 17],
		['run 17', 17],
		[' pr 17 ', 17],
		['R17', null],
		['17a', null]
	])('%s → %s', (ref, expected) => {
		expect(printRunNumber(ref)).toBe(expected);
	});
});
