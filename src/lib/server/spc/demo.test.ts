import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { openTestDatabase } from '../testing';
import type { Db } from '../db';
import { mailOutbox } from '../db/schema';
import { seedDemoData } from '../seed';
import { chartSummary } from './summary';
import { listSignals } from './signals';

let db: Db;
let close: () => void;
beforeEach(() => ({ db, close } = openTestDatabase()));
afterEach(() => close());

describe('SPC demo', () => {
	it('seeds three charts; the logged 65 mm/s run is a stored, mailed signal', async () => {
		await seedDemoData(db);
		const charts = chartSummary(db);
		expect(charts.map((c) => c.name)).toEqual(
			expect.arrayContaining([
				'Squeegee speed · PB-100 · SMT-1',
				'Squeegee pressure · PB-100 · SMT-1',
				'Paste volume · PB-100 · SMT-1'
			])
		);
		// Worst first: the chart with open signals leads.
		expect(charts[0]).toMatchObject({
			name: 'Squeegee speed · PB-100 · SMT-1',
			phase: 'II',
			limitsVersion: 1
		});
		const open = listSignals(db, { status: 'open' });
		expect(open.some((s) => s.rule === 'we-1' && s.value === 65)).toBe(true);
		const mails = db
			.select()
			.from(mailOutbox)
			.all()
			.filter((m) => m.kind === 'signal');
		expect(mails).toHaveLength(1);
		expect(mails[0].toAddresses).toBe('engineer@fenmoor.example');
	}, 30_000);
});
