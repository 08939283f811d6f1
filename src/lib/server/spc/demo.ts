import { and, asc, eq } from 'drizzle-orm';
import type { Db } from '../db';
import { lines, printRuns, products, users } from '../db/schema';
import { createCharacteristic, setFollowing } from './characteristics';
import { excludePoint, freezeLimits } from './limits-lifecycle';
import { evaluateSignalsFor } from './signals';

/**
 * SPC demo for Fenmoor Works (invented): on the print-log demo's runs of PB-100 on SMT-1, a
 * squeegee-speed I-MR chart frozen on the first nine runs (so the logged 65 mm/s run later
 * shows as a stored signal, mailed to the engineer who follows the chart), a squeegee-pressure
 * chart left in Phase I (one run excluded with a reason), and a paste-volume between/within
 * chart that fills as SPI data arrives. Runs after the factory, people and print-log demos;
 * does nothing when they are absent.
 */
export async function seedDemoSpc(db: Db): Promise<void> {
	const product = db.select().from(products).where(eq(products.code, 'PB-100')).get();
	const line = db.select().from(lines).where(eq(lines.code, 'SMT-1')).get();
	if (!product || !line) return;
	const engineer = db.select().from(users).where(eq(users.email, 'engineer@fenmoor.example')).get();
	const system = null;
	const speed = createCharacteristic(
		db,
		{
			name: 'Squeegee speed · PB-100 · SMT-1',
			productId: product.id,
			lineIds: [line.id],
			measure: 'print-parameter',
			parameterKey: 'squeegeeSpeedMmS',
			chartKind: 'i-mr',
			lsl: 30,
			target: 40,
			usl: 60,
			rules: ['we-1', 'we-2', 'we-3', 'we-4', 'nelson-3']
		},
		system
	);
	const pressure = createCharacteristic(
		db,
		{
			name: 'Squeegee pressure · PB-100 · SMT-1',
			productId: product.id,
			lineIds: [line.id],
			measure: 'print-parameter',
			parameterKey: 'squeegeePressureKg',
			chartKind: 'i-mr',
			lsl: 5.5,
			target: 7,
			usl: 8.5
		},
		system
	);
	createCharacteristic(
		db,
		{
			name: 'Paste volume · PB-100 · SMT-1',
			productId: product.id,
			lineIds: [line.id],
			measure: 'volume-pct',
			chartKind: 'between-within'
		},
		system
	);
	if (engineer) setFollowing(db, speed.id, engineer.id, true);
	const runs = db
		.select({ id: printRuns.id, startedAt: printRuns.startedAt })
		.from(printRuns)
		.where(and(eq(printRuns.productId, product.id), eq(printRuns.lineId, line.id)))
		.orderBy(asc(printRuns.startedAt))
		.all();
	if (runs.length < 10) return;
	excludePoint(db, pressure.id, `run:${runs[2].id}`, 'Demo: new blade fitted mid-run', system);
	// Only nine runs exist before the logged 65 mm/s run: preliminary limits, frozen below the
	// usual 20 subgroups on purpose and said so in the note (the chart page shows it too).
	freezeLimits(
		db,
		speed.id,
		{
			baselineTo: runs[8].startedAt,
			note: 'Preliminary demo baseline: first nine runs (fewer than 20)',
			minSubgroups: 9
		},
		system
	);
	await evaluateSignalsFor(db, [{ productId: product.id, lineId: line.id }]);
}
