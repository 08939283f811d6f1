import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import { seedDemoData } from '../seed';
import { readTraceQuery, traceBoard } from './trace';

let t: ReturnType<typeof openTestDatabase>;
beforeAll(async () => {
	t = openTestDatabase();
	await seedDemoData(t.db);
}, 120_000);
afterAll(() => t.close());

describe('traceBoard', () => {
	it('finds a board by its exact serial with its run, stencil, lot, recipe and operator', () => {
		const a = traceBoard(t.db, 'FW-SH220-0000001');
		expect(a.match).toBe('exact');
		expect(a.boards).toHaveLength(1);
		const b = a.boards[0];
		expect(b.board.product).toBe('SH-220');
		expect(b.stencil).toMatchObject({
			name: 'ST-SH220',
			technology: 'laser-stainless',
			thicknessUm: 100
		});
		expect(b.pasteLot).toMatchObject({ lotNumber: 'PL-2026-0390', powderType: 4 });
		expect(b.recipe?.version).toBeGreaterThanOrEqual(1);
		expect(b.operator?.name).toBe('Cleo Marrowby');
		expect(b.run?.parameters.squeegeeAngleDeg).toBe(60);
		expect(b.board.pass + b.board.warn + b.board.fail).toBe(b.board.pads);
		const flagged = b.board.warn + b.board.fail;
		expect(b.flaggedPads.length).toBe(Math.min(50, flagged));
		if (b.flaggedPads.length > 0)
			expect(b.flaggedPads[0].result).toBe(b.board.fail > 0 ? 'fail' : 'warn');
	});
	it('lists serials that begin with a prefix, and says when nothing matches', () => {
		const a = traceBoard(t.db, 'FW-SH220-000001');
		expect(a.match).toBe('prefix');
		expect(a.boards.map((b) => b.board.serial)).toEqual(
			Array.from({ length: 10 }, (_, i) => `FW-SH220-000001${i}`)
		);
		expect(traceBoard(t.db, 'NO-SUCH-').match).toBe('none');
	});
	it('names the signals the board took part in (by its board id or its run)', () => {
		const s = t.db.$client
			.prepare(`select id, board_ids, point_keys from spc_signals order by id limit 1`)
			.get() as { id: number; board_ids: string; point_keys: string } | undefined;
		expect(s, 'the demo has at least one signal').toBeDefined();
		const boardIds = JSON.parse(s!.board_ids) as number[];
		const runKey = (JSON.parse(s!.point_keys) as string[]).find((k) => k.startsWith('run:'));
		const boardId =
			boardIds[0] ??
			(t.db.$client
				.prepare(`select id from spi_boards where print_run_id = ? limit 1`)
				.pluck()
				.get(Number(runKey!.slice(4))) as number);
		const serial = t.db.$client
			.prepare(`select serial from spi_boards where id = ?`)
			.pluck()
			.get(boardId) as string;
		const a = traceBoard(t.db, serial);
		const board = a.boards.find((b) => b.board.id === boardId)!;
		expect(board.signals.map((x) => x.id)).toContain(s!.id);
	});
	it('requires a serial and refuses unknown parameters', () => {
		expect(() => readTraceQuery(new URL('http://x/api/trace'))).toThrow();
		expect(() => readTraceQuery(new URL('http://x/api/trace?serial=A&limit=5'))).toThrow();
		expect(readTraceQuery(new URL('http://x/api/trace?serial=%20FW-1%20')).serial).toBe('FW-1');
	});
});
