import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { openTestDatabase } from './testing';
import type { Db } from './db';
import { seedDemoData } from './seed';

let db: Db;
let close: () => void;
beforeAll(async () => {
	({ db, close } = openTestDatabase());
	await seedDemoData(db);
}, 60_000);
afterAll(() => close());

// Issue 13, finding 9: a serial found in SPI leads to its print run, stencil and paste lot.
describe('demo: SPI boards and print runs tell one story', () => {
	type Row = {
		serial: string;
		runId: number | null;
		runSerial: string | null;
		boards: number | null;
		stencil: string | null;
		lot: string | null;
	};
	const rows = () =>
		db.$client
			.prepare(
				`select b.serial, b.print_run_id as runId, r.board_serial as runSerial, r.boards_printed as boards,
				 s.name as stencil, l.lot_number as lot
				 from spi_boards b left join print_runs r on r.id = b.print_run_id
				 left join stencils s on s.id = r.stencil_id left join paste_lots l on l.id = r.paste_lot_id
				 where b.product_code = 'PB-100'`
			)
			.all() as Row[];

	it('every demo board belongs to a print run with a stencil and a paste lot', () => {
		const all = rows();
		expect(all.length).toBeGreaterThan(100);
		for (const r of all) {
			expect(r.runId, r.serial).not.toBeNull();
			expect(r.stencil, r.serial).toBe('ST-PB100');
			expect(r.lot, r.serial).toMatch(/^PL-/);
		}
	});

	it("each board's serial lies in its run's serial range, starting at the serial the run logged", () => {
		const num = (s: string) => Number(/(\d+)$/.exec(s)?.[1]);
		for (const r of rows()) {
			expect(r.runSerial, r.serial).not.toBeNull();
			const offset = num(r.serial) - num(r.runSerial ?? '');
			expect(offset, r.serial).toBeGreaterThanOrEqual(0);
			expect(offset, r.serial).toBeLessThan(r.boards ?? 0);
		}
		// And a run's logged serial is an inspected board, so the run page finds its inspections.
		const serials = new Set(rows().map((r) => r.serial));
		const runSerials = new Set(rows().map((r) => r.runSerial));
		for (const s of runSerials) expect(serials.has(s ?? ''), String(s)).toBe(true);
	});
});
