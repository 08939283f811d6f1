import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import { seedDemoData } from '../seed';

let t: ReturnType<typeof openTestDatabase>;
beforeEach(() => {
	t = openTestDatabase();
});
afterEach(() => t.close());

const one = (sql: string) => t.db.$client.prepare(sql).pluck().get() as number;

describe('seedDemoSpi (through seedDemoData)', () => {
	it('stores 150 PB-100 boards on SMT-1 linked to runs and apertures, with a volume drift', async () => {
		await seedDemoData(t.db);
		expect(
			one(`select count(*) from spi_boards where product_code = 'PB-100' and line_code = 'SMT-1'`)
		).toBe(150);
		expect(one(`select count(*) from spi_boards where stencil_id is null`)).toBe(0);
		// Runs exist when the print-log demo ran; then every board falls inside one.
		if (one(`select count(*) from print_runs`) > 0)
			expect(one(`select count(*) from spi_boards where print_run_id is null`)).toBe(0);
		expect(one(`select count(*) from spi_pads where aperture_id is null`)).toBe(0);
		expect(one(`select count(*) from spi_boards where te_count = 0`)).toBe(0);
		const early = one(
			`select avg(volume_pct_mean) from (select volume_pct_mean from spi_boards where product_code = 'PB-100' order by inspected_at limit 30)`
		);
		const late = one(
			`select avg(volume_pct_mean) from (select volume_pct_mean from spi_boards where product_code = 'PB-100' order by inspected_at desc limit 30)`
		);
		expect(early - late).toBeGreaterThan(5);
		expect(one(`select count(*) from spi_imports where status = 'imported'`)).toBeGreaterThan(1);
	}, 60_000);
});
