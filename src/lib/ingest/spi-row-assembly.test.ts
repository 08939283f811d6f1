import { describe, expect, it } from 'vitest';
import { createRowAssembler, type RowAssemblerOptions } from './spi-row-assembly';
import { emptyCheckedRow, type CheckedRow } from './spi-row-validation';

const T = Date.UTC(2026, 2, 2, 8);

function row(line: number, serial: string, values: Partial<CheckedRow> = {}): CheckedRow {
	return {
		...emptyCheckedRow(),
		line,
		boardSerial: serial,
		inspectedAtMs: T,
		lineCode: 'L1',
		productCode: 'PB-100',
		refdes: `C${line}`,
		pad: '1',
		volumePct: 100,
		areaPct: 100,
		heightUm: 120,
		offsetXUm: 0,
		offsetYUm: 0,
		...values
	};
}

function assembler(extra: Partial<RowAssemblerOptions> = {}) {
	const issues: string[] = [];
	const rows = createRowAssembler({
		batchSize: 2,
		maxBoards: 10,
		skipRows: false,
		conflict: (line, field, message) => issues.push(`${line} ${field}: ${message}`),
		tooManyBoards: ({ row, message }) => issues.push(`${row}: ${message}`),
		...extra
	});
	return { rows, issues };
}

describe('createRowAssembler', () => {
	it('groups rows into boards and hands out full batches with their new boards', () => {
		const { rows } = assembler();
		rows.accept(row(2, 'RB-A'));
		rows.accept(row(3, 'RB-B'));
		rows.accept(row(4, 'RB-A', { result: 2 }));
		const full = rows.take();
		expect(full).toHaveLength(1);
		expect(full[0].newBoards.map((b) => b.boardSerial)).toEqual(['RB-A', 'RB-B']);
		rows.flush();
		const [last] = rows.take();
		expect([...last.boardIndex]).toEqual([0]);
		expect(rows.aggregates().map((a) => [a.rows, a.results.fail])).toEqual([
			[2, 1],
			[1, 0]
		]);
		expect(rows.rowsAccepted).toBe(3);
	});

	it('rejects a row whose board-level values differ from its board', () => {
		const { rows, issues } = assembler({ skipRows: true });
		rows.accept(row(2, 'RB-A'));
		rows.accept(row(3, 'RB-A', { lineCode: 'L2', stencil: 'ST-1' }));
		expect(issues).toEqual([
			'3 line: line "L2" differs from "L1" than earlier rows of board RB-A inspected 2026-03-02T08:00:00.000Z',
			'3 stencil: stencil "ST-1" differs from "" than earlier rows of board RB-A inspected 2026-03-02T08:00:00.000Z'
		]);
		expect([rows.rowsAccepted, rows.rowsRejected, rows.rejected]).toEqual([1, 1, false]);
	});

	it('under reject-file hands out nothing after the first bad row, but keeps counting', () => {
		const { rows } = assembler();
		rows.accept(row(2, 'RB-A'));
		rows.reject();
		rows.accept(row(4, 'RB-B'));
		rows.flush();
		expect(rows.take()).toEqual([]);
		expect([rows.rowsAccepted, rows.rowsRejected, rows.rejected]).toEqual([2, 1, true]);
	});

	it('stops at the board budget', () => {
		const { rows, issues } = assembler({ maxBoards: 1 });
		rows.accept(row(2, 'RB-A'));
		rows.accept(row(3, 'RB-B'));
		expect(issues).toEqual([
			'3: board inspection RB-B is one more than the limit of 1 per file (SPI_MAX_BOARDS_PER_FILE); split the export'
		]);
		expect(rows.boards).toHaveLength(1);
	});
});
